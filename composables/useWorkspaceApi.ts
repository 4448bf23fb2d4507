/**
 * The map workspace's calls to the server (products, readout, areas, hazard thresholds) and the
 * shapes of their answers. Images are plain URLs: the map's image source fetches them itself.
 */
import type { MultiPolygon, Polygon } from 'geojson'
import type { AreaRowProducts, DisplayClass, Hazard, PointReadout, ProductName, ThresholdDirection } from '#shared/schemas/products'
import type { AreaRecord } from '#shared/schemas/areas'
import type { LeadStructure } from '#shared/utils/correlationShape'

export type DisplayClassDto = DisplayClass

/** The lead time of an answer, or the time window it covers (window set). */
export interface LeadDto {
  index: number
  validTime: string
  when: string
  /** The first (or only) lead time alone. */
  leadWhen?: string
  window?: { from: number; to: number; extreme: 'max' | 'min'; validTimes: string[]; timeCoherent: boolean; meaning: string } | null
}

/** Median fitted correlation shape of a lead time's members, with its ring for the map. */
export type StructureDto = LeadStructure

export interface ProductSummary {
  run: { id: number; name: string; isDemo: boolean; displayUnits: string; standardName: string | null; leadTimes: string[] }
  lead: LeadDto
  scenarios: { members: number; of: number; samplesPerMember: number | null; samples: number }
  request: { product: ProductName; threshold: number; direction: ThresholdDirection; radiusKm: number; radiusCells: number }
  event: string
  legend: { kind: 'probability' | 'value'; title: string; units: string; classes: DisplayClassDto[]; explanation?: string; missingNote?: string; windowNote?: string }
  classCounts: number[]
  missingCells: number
  maximum: number | null
  valueRange: [number, number]
  grid: { kind: string; nx: number; ny: number; factor: number; fineSpacingKm: number; outline: [number, number][]; bounds: [number, number, number, number] }
  image: { corners: [number, number][]; width: number; height: number }
  timing: { loadMs: number; requestLoadMs: number; computeMs: number }
  structure: StructureDto | null
}

export type PointReadoutDto = PointReadout & { lead: LeadDto; event: string }

export type AreaDto = AreaRecord<string> & { canEdit: boolean }

export type AreaRowDto = AreaRowProducts

export interface AreaProductsDto {
  area: { id: number; name: string }
  run: { id: number; name: string; leadTimes: string[] }
  threshold: number
  direction: ThresholdDirection
  units: string
  cells: number
  areaKm2?: number
  note?: string
  event?: string
  leads: (AreaRowDto & { leadIndex: number; validTime: string; when: string })[]
  window: (AreaRowDto & { from: number; to: number; validTimes: string[] }) | null
  windowNote?: string
  windowMeaning?: string
  computeMs: number
}

export interface HazardDto {
  hazard: Hazard
  label: string
  units: string
  displayUnits: string
  direction: ThresholdDirection
  standardNames: string[]
  note: string
  defaults: { label: string; value: number }[]
  thresholds: { id: number; label: string; value: number; units: string; direction: ThresholdDirection; isDefault: boolean }[]
}

export type DrawMode = 'none' | 'polygon' | 'rectangle' | 'circle'

/** A shape just drawn on the map (terra-draw), before it is saved. */
export interface DrawnShape { kind: 'polygon' | 'rectangle' | 'circle'; geometry: Polygon; circle?: { centre: [number, number]; radiusKm: number } }

/** An area shape as the server accepts it: exactly one of geometry, circle or rectangle. */
export type AreaShape =
  | { geometry: Polygon | MultiPolygon }
  | { circle: { centre: [number, number]; radiusKm: number } }
  | { rectangle: { west: number; south: number; east: number; north: number } }

export interface ProductQuery { lead: number; windowTo?: number; threshold: number; direction: ThresholdDirection; radius: number; product: ProductName }

function query(params: Record<string, string | number | boolean | undefined>): string {
  const q = new URLSearchParams()
  for (const [k, v] of Object.entries(params)) if (v !== undefined) q.set(k, String(v))
  return q.toString()
}

export function useWorkspaceApi() {
  return {
    productImageUrl: (runId: number, q: ProductQuery, boundaries: boolean) =>
      `/api/runs/${runId}/products/map.png?${query({ ...q, boundaries: boundaries ? 1 : 0 })}`,
    coarseImageUrl: (runId: number, lead: number, member: number) => `/api/runs/${runId}/fields/coarse.png?${query({ lead, member })}`,
    sampleImageUrl: (runId: number, lead: number, member: number, sample: number) => `/api/runs/${runId}/fields/sample.png?${query({ lead, member, sample })}`,
    summary: (runId: number, q: ProductQuery) => $fetch<ProductSummary>(`/api/runs/${runId}/products/summary?${query({ ...q })}`),
    point: (runId: number, q: ProductQuery, lon: number, lat: number) =>
      $fetch<PointReadoutDto>(`/api/runs/${runId}/products/point?${query({ lead: q.lead, windowTo: q.windowTo, threshold: q.threshold, direction: q.direction, radius: q.radius, lon, lat })}`),
    /** Per lead time, and over the window windowFrom..windowTo (every lead time when not given). */
    areaProducts: (runId: number, areaId: number, threshold: number, direction: ThresholdDirection, window: { windowFrom?: number; windowTo?: number } = {}) =>
      $fetch<AreaProductsDto>(`/api/runs/${runId}/areas/${areaId}/products?${query({ threshold, direction, ...window })}`),
    listAreas: () => $fetch<{ areas: AreaDto[] }>('/api/areas'),
    createArea: (name: string, tags: string[], shape: AreaShape) => $fetch<{ area: AreaDto }>('/api/areas', { method: 'POST', body: { name, tags, ...shape } }),
    updateArea: (id: number, patch: { name?: string; tags?: string[] } & Partial<{ geometry: Polygon | MultiPolygon; circle: { centre: [number, number]; radiusKm: number }; rectangle: { west: number; south: number; east: number; north: number } }>) =>
      $fetch<{ area: AreaDto }>(`/api/areas/${id}`, { method: 'PATCH', body: patch }),
    deleteArea: (id: number) => $fetch(`/api/areas/${id}`, { method: 'DELETE' }),
    importAreas: (document: unknown, tag?: string) =>
      $fetch<{ areas: AreaDto[] }>(`/api/areas/import${tag ? `?${query({ tag })}` : ''}`, { method: 'POST', body: document as Record<string, unknown> }),
    hazards: () => $fetch<{ hazards: HazardDto[] }>('/api/hazards'),
    saveHazard: (hazard: Hazard, thresholds: { label: string; value: number }[]) =>
      $fetch<{ hazard: HazardDto }>(`/api/hazards/${hazard}`, { method: 'PUT', body: { thresholds } }),
  }
}

/** "30 %", with "< 1 %" and "> 99 %" so that rare but possible events never read as 0 % or 100 %. */
export function formatChance(p: number | null | undefined): string {
  if (p === null || p === undefined || !Number.isFinite(p)) return '—'
  if (p <= 0) return '0 %'
  if (p >= 1) return '100 %'
  if (p < 0.005) return '< 1 %'
  if (p > 0.995) return '> 99 %'
  return `${Math.round(p * 100)} %`
}

/** A number in the run's units, with a real minus sign. */
export function formatValue(v: number | null | undefined, digits = 1): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—'
  const r = Number(v.toFixed(digits))
  return (Object.is(r, -0) ? 0 : r).toFixed(digits).replace('-', '−')
}

export function formatLonLat(lon: number, lat: number, digits = 2): string {
  const ew = lon < 0 ? 'W' : 'E', ns = lat < 0 ? 'S' : 'N'
  return `${Math.abs(lat).toFixed(digits)}° ${ns}, ${Math.abs(lon).toFixed(digits)}° ${ew}`
}
