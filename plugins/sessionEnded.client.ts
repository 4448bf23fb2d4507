// When the server says the session has ended (deactivated, role changed, expired) in the middle
// of work, go to the sign-in page with the reason instead of leaving a page that fails silently.
export default defineNuxtPlugin(() => {
  const { loggedIn, fetch: refreshSession } = useUserSession()
  const router = useRouter()
  globalThis.$fetch = $fetch.create({
    async onResponseError({ request, response }) {
      const url = typeof request === 'string' ? request : (request as Request).url
      if (response.status !== 401 || !loggedIn.value || url.includes('/api/auth/')) return
      await refreshSession()
      const here = router.currentRoute.value
      if (here.path !== '/login') await router.push({ path: '/login', query: { next: here.fullPath, ended: '1' } })
    },
  }) as typeof globalThis.$fetch
})
