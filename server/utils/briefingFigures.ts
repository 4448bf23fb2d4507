/**
 * Map figures for briefing PDFs: the workspace's product renderer (renderProductImage) on a white
 * background, with the basemap (world-atlas land at 1:110 million; the invented coastline for demo
 * runs), the run's grid outline and the briefing's areas drawn in, plus the legend classes.
 */
import type { MultiPolygon } from 'geojson'
import { feature } from 'topojson-client'
import land110m from 'world-atlas/land-110m.json'
import { SEREVAN_COAST } from '../../shared/demo/region'
import type { BriefingFigure } from '../../shared/schemas/briefings'
import type { ImageLine } from './productImage'
import { pictureLines, renderProductImage, type ProductLegend } from './products'
import { runPlacement, type RunRow } from './runSamples'
import { windowLeadSamples } from './windowSamples'

type Ring = [number, number][]

let landRings: Ring[] | null = null

/** Outer and inner rings of the world's land polygons, [lon, lat] (loaded once). */
function worldLandRings(): Ring[] {
  if (landRings) return landRings
  const topology = land110m as unknown as { objects: { land: unknown } }
  const land = feature(topology, topology.objects.land)
  const features = 'features' in land ? land.features : [land]
  const rings: Ring[] = []
  for (const f of features) {
    const g = f.geometry as { type: string; coordinates: unknown } | null
    if (g?.type === 'Polygon') rings.push(...(g.coordinates as Ring[]))
    if (g?.type === 'MultiPolygon') for (const p of g.coordinates as Ring[][]) rings.push(...p)
  }
  landRings = rings
  return rings
}

/** Rings whose bounding box meets [west, south, east, north] (with a margin), so a figure draws only what it shows. */
function ringsNear(rings: Ring[], bounds: [number, number, number, number]): Ring[] {
  const [w, s, e, n] = bounds
  const mx = (e - w) * 0.1, my = (n - s) * 0.1
  return rings.filter((ring) => {
    let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity
    for (const [x, y] of ring) { if (x < x0) x0 = x; if (x > x1) x1 = x; if (y < y0) y0 = y; if (y > y1) y1 = y }
    return x1 >= w - mx && x0 <= e + mx && y1 >= s - my && y0 <= n + my
  })
}

export interface FigureArea { name: string; geometry: MultiPolygon }

export interface RenderedFigure {
  png: Buffer
  width: number
  height: number
  legend: ProductLegend
  /** What the basemap shows, for the caption ("invented coastline" for demo runs). */
  basemapNote: string
}

const LAND: ImageLine['colour'] = [86, 95, 103, 255]
const HALO: ImageLine['colour'] = [255, 255, 255, 230]

/** One figure as a PNG (about 2 pixels per fine cell, at most 1024 wide) with its legend. */
export async function renderBriefingFigure(run: RunRow, figure: BriefingFigure, areas: FigureArea[], width = 900): Promise<RenderedFigure> {
  const placement = runPlacement(run)
  const entry = await windowLeadSamples(run, figure.leadIndex, figure.windowTo ?? undefined, figure.direction)
  const coast = ringsNear(worldLandRings(), placement.bounds)
  const areaRings = areas.flatMap((a) => a.geometry.coordinates.flatMap((poly) => poly as Ring[]))
  const lines: ImageLine[] = [
    { lines: coast, colour: LAND, widthPx: 1.5 },
    // A white halo under each area outline keeps it readable on every class colour.
    { lines: areaRings, colour: HALO, widthPx: 5 },
    // The workspace's own picture lines: invented coast (demo runs), grid outline, area outlines.
    ...pictureLines(placement, areas as { geometry: { coordinates: number[][][][] } }[], run.isDemo ? SEREVAN_COAST : undefined),
  ]
  const image = renderProductImage(run, entry, placement, {
    product: figure.product, threshold: figure.threshold, direction: figure.direction, radiusKm: figure.radiusKm,
  }, { width, boundaries: true, background: [255, 255, 255], lines })
  const basemapNote = run.isDemo
    ? 'Dark grey line: the invented demo coastline. Black outlines: the briefing\'s areas. Teal frame: the forecast grid.'
    : 'Grey lines: coastlines (world land at 1:110 million). Black outlines: the briefing\'s areas. Teal frame: the forecast grid.'
  return { png: image.png, width: image.frame.width, height: image.frame.height, legend: image.legend, basemapNote }
}
