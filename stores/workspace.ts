import { defineStore } from 'pinia'
import type { Hazard, ProductName, ThresholdDirection } from '#shared/schemas/products'

export type MapLayerChoice = 'product' | 'coarse' | 'sample'

/**
 * What the map workspace shows: one run, one lead time (or a time window from it), one threshold with its direction,
 * one product and radius. Kept in a store so the map, the legend, the readout and the area
 * tables always describe the same numbers.
 */
export const useWorkspaceStore = defineStore('workspace', () => {
  const runId = ref<number | null>(null)
  const lead = ref(0)
  /** Last lead index of a time window starting at `lead` (products count "at any of its times"), or null for one lead time. */
  const windowTo = ref<number | null>(null)
  const hazard = ref<Hazard | 'custom'>('custom')
  const threshold = ref(20)
  const direction = ref<ThresholdDirection>('above')
  const product = ref<ProductName>('nmep')
  const radiusKm = ref(10)
  const opacity = ref(0.8)
  const boundaries = ref(true)
  const layer = ref<MapLayerChoice>('product')
  const member = ref(0)
  const sample = ref(0)
  /** Areas whose tables are shown, and the one highlighted on the map. */
  const shownAreaIds = ref<number[]>([])
  const selectedAreaId = ref<number | null>(null)
  /** The place of the readout (hover or a pinned click / typed position). */
  const point = ref<{ lon: number; lat: number; pinned: boolean } | null>(null)

  /** Query of every product request: the same threshold, direction, radius and lead everywhere. */
  const productQuery = computed(() => ({
    lead: lead.value, threshold: threshold.value, direction: direction.value, radius: radiusKm.value, product: product.value,
    windowTo: windowTo.value !== null && windowTo.value > lead.value ? windowTo.value : undefined,
  }))
  // A window ends after its start: moving the start past the end returns to one lead time.
  watch(lead, (l) => { if (windowTo.value !== null && windowTo.value <= l) windowTo.value = null })

  function openRun(id: number) {
    if (runId.value !== id) {
      runId.value = id
      lead.value = 0
      windowTo.value = null
      member.value = 0
      sample.value = 0
      point.value = null
    }
  }

  function toggleArea(id: number, shown?: boolean) {
    const on = shown ?? !shownAreaIds.value.includes(id)
    shownAreaIds.value = on ? [...new Set([...shownAreaIds.value, id])] : shownAreaIds.value.filter((x) => x !== id)
  }

  return {
    runId, lead, windowTo, hazard, threshold, direction, product, radiusKm, opacity, boundaries, layer, member, sample,
    shownAreaIds, selectedAreaId, point, productQuery, openRun, toggleArea,
  }
})
