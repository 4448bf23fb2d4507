/**
 * False during server rendering and until the page is interactive. Forms stay disabled until
 * then, so nothing typed or clicked before hydration is lost or sent as a plain GET.
 */
export function useHydrated() {
  const hydrated = ref(false)
  onMounted(() => (hydrated.value = true))
  return hydrated
}
