/**
 * Map images of gridded products, re-projected onto a Web-Mercator pixel grid (EPSG:3857, the
 * map's own projection): columns are equally spaced in longitude, rows equally spaced in the
 * Mercator ordinate y = ln tan(π/4 + φ/2). An image covering [west, east] × [south, north] is
 * therefore placed exactly by its four corners in an image source, and each output pixel shows
 * the grid cell under its centre (nearest cell, no smoothing). Pixels outside the grid or on a
 * missing value stay transparent.
 *
 * The same renderer serves briefing PDFs: give it a background and lines (coastlines, area
 * outlines) and it draws them into the picture.
 */
import { PNG } from 'pngjs'
import { boundaryColour, type Rgb, type Rgba } from '../../shared/utils/colourScale'

const DEG = Math.PI / 180
/** Web-Mercator latitude limit (the square world of EPSG:3857), degrees. */
export const MERCATOR_MAX_LAT = 85.0511287798066

export interface MercatorFrame {
  /** Longitudes in degrees; east > west (east may exceed 180 across the 180° line). */
  west: number
  east: number
  south: number
  north: number
  width: number
  height: number
  /** Image corners for the map: [lon, lat] of top-left, top-right, bottom-right, bottom-left. */
  corners: [[number, number], [number, number], [number, number], [number, number]]
}

/** Mercator ordinate of a latitude in degrees (unit sphere), clamped to the EPSG:3857 limit. */
export function mercatorY(lat: number): number {
  const phi = Math.max(-MERCATOR_MAX_LAT, Math.min(MERCATOR_MAX_LAT, lat)) * DEG
  return Math.log(Math.tan(Math.PI / 4 + phi / 2))
}

/** Latitude in degrees of a Mercator ordinate (inverse of mercatorY): 2·atan(e^y) − π/2. */
export function inverseMercatorY(y: number): number {
  return (2 * Math.atan(Math.exp(y)) - Math.PI / 2) / DEG
}

/**
 * The pixel grid for bounds [west, south, east, north] at `width` pixels: the height keeps
 * Mercator's aspect, (y(north) − y(south)) / ((east − west)·π/180) × width, at least 1.
 */
export function mercatorFrame(bounds: [number, number, number, number], width: number): MercatorFrame {
  const [west, south0, east0, north0] = bounds
  const east = east0 <= west ? east0 + 360 : east0
  const south = Math.max(-MERCATOR_MAX_LAT, south0), north = Math.min(MERCATOR_MAX_LAT, north0)
  if (!(north > south)) throw new Error(`image bounds need south < north, got ${south0}, ${north0}`)
  if (!Number.isInteger(width) || width < 1) throw new Error(`image width must be a positive integer, got ${width}`)
  const height = Math.max(1, Math.round((width * (mercatorY(north) - mercatorY(south))) / ((east - west) * DEG)))
  return { west, east, south, north, width, height, corners: [[west, north], [east, north], [east, south], [west, south]] }
}

/** Longitude and latitude of the centre of pixel (px, py); py = 0 is the top (north) row. */
export function pixelCentre(frame: MercatorFrame, px: number, py: number): [number, number] {
  const lon = frame.west + ((px + 0.5) / frame.width) * (frame.east - frame.west)
  const yTop = mercatorY(frame.north), yBottom = mercatorY(frame.south)
  const lat = inverseMercatorY(yTop - ((py + 0.5) / frame.height) * (yTop - yBottom))
  return [lon, lat]
}

/** Fractional pixel coordinates (x to the east, y down) of a point; the inverse of pixelCentre up to the half-pixel. */
export function lonLatToPixel(frame: MercatorFrame, lon: number, lat: number): [number, number] {
  let l = lon
  while (l < frame.west - 180) l += 360
  while (l > frame.west + 180 + (frame.east - frame.west)) l -= 360
  const yTop = mercatorY(frame.north), yBottom = mercatorY(frame.south)
  return [((l - frame.west) / (frame.east - frame.west)) * frame.width, ((yTop - mercatorY(lat)) / (yTop - yBottom)) * frame.height]
}

/**
 * For every output pixel (row-major, top row first), the grid cell under its centre as given by
 * `locate(lon, lat)` (−1 = none). Geometry only: compute once per grid and width, reuse for every product.
 */
export function pixelCellTable(frame: MercatorFrame, locate: (lon: number, lat: number) => number): Int32Array {
  const table = new Int32Array(frame.width * frame.height)
  const lons = Float64Array.from({ length: frame.width }, (_, px) => pixelCentre(frame, px, 0)[0])
  for (let py = 0; py < frame.height; py++) {
    const lat = pixelCentre(frame, 0, py)[1]
    for (let px = 0; px < frame.width; px++) {
      const lon = lons[px]! > 180 ? lons[px]! - 360 : lons[px]!
      table[py * frame.width + px] = locate(lon, lat)
    }
  }
  return table
}

/** Classes to draw: a colour per class index, and which classes are hatched instead of filled. */
export interface ImagePalette {
  colours: Rgba[]
  /** Class indices drawn as diagonal hatching (e.g. "no scenario"), with their line colour. */
  hatched?: Map<number, Rgba>
  hatchSpacingPx?: number
}

export interface ImageLine {
  /** Each line as [lon, lat] positions (a closed ring repeats its first position). */
  lines: [number, number][][]
  colour: Rgba
  widthPx: number
}

export interface RenderOptions {
  frame: MercatorFrame
  /** Pixel → cell table from pixelCellTable. */
  table: Int32Array
  /** Class index of every cell (−1 = transparent: missing value). */
  classOfCell: Int16Array | Int32Array
  palette: ImagePalette
  /** Draw a 1-pixel line between neighbouring pixels of different classes (contrast ≥ 3:1 with both). */
  boundaries?: boolean
  /** Opaque colour painted first (PDF pictures); none = transparent (map overlays). */
  background?: Rgb
  /** Lines drawn last, in order: basemap coastlines, grid outline, areas of interest. */
  lines?: ImageLine[]
}

/** Alpha-composites colour c over pixel p of an RGBA buffer ("over" operator, straight alpha). */
function blend(data: Uint8Array, p: number, c: Rgba): void {
  const a = c[3] / 255
  if (a <= 0) return
  const below = data[p + 3]! / 255
  const out = a + below * (1 - a)
  for (let ch = 0; ch < 3; ch++) data[p + ch] = Math.round((c[ch]! * a + data[p + ch]! * below * (1 - a)) / out)
  data[p + 3] = Math.round(out * 255)
}

/** RGBA pixels (row-major, top row first) of a classified grid drawn on the frame. */
export function renderClasses(options: RenderOptions): Uint8Array {
  const { frame, table, classOfCell, palette } = options
  const { width, height } = frame
  const data = new Uint8Array(width * height * 4)
  if (options.background) for (let p = 0; p < width * height; p++) data.set([...options.background, 255], p * 4)
  const pixelClass = new Int32Array(width * height)
  for (let p = 0; p < pixelClass.length; p++) {
    const cell = table[p]!
    pixelClass[p] = cell < 0 ? -1 : classOfCell[cell]!
  }
  const spacing = palette.hatchSpacingPx ?? 7
  for (let py = 0; py < height; py++) for (let px = 0; px < width; px++) {
    const p = py * width + px
    const c = pixelClass[p]!
    if (c < 0) continue
    const hatch = palette.hatched?.get(c)
    if (hatch) { if ((px + py) % spacing === 0) blend(data, p * 4, hatch) }
    else blend(data, p * 4, palette.colours[c]!)
  }
  if (options.boundaries) drawClassBoundaries(data, pixelClass, width, height, palette)
  for (const line of options.lines ?? []) drawLines(data, frame, line)
  return data
}

/**
 * Marks each pixel that has a 4-neighbour of another drawn class with its own class's edge colour
 * (black or white, ≥ 4.58:1 against it), so both sides of a boundary carry a visible edge.
 * Hatched classes lie over the basemap: their edge is chosen as for white.
 */
function drawClassBoundaries(data: Uint8Array, pixelClass: Int32Array, width: number, height: number, palette: ImagePalette): void {
  const edge = palette.colours.map((c, k): Rgba => [...boundaryColour(palette.hatched?.has(k) ? [255, 255, 255] : c), 255])
  const differs = (a: number, b: number) => b >= 0 && b !== a
  for (let py = 0; py < height; py++) for (let px = 0; px < width; px++) {
    const p = py * width + px
    const a = pixelClass[p]!
    if (a < 0) continue
    if ((px + 1 < width && differs(a, pixelClass[p + 1]!)) || (px > 0 && differs(a, pixelClass[p - 1]!))
      || (py + 1 < height && differs(a, pixelClass[p + width]!)) || (py > 0 && differs(a, pixelClass[p - width]!))) data.set(edge[a]!, p * 4)
  }
}

/** Draws polylines with round caps by stamping discs along each segment (enough for 1–4 px map lines). */
export function drawLines(data: Uint8Array, frame: MercatorFrame, line: ImageLine): void {
  const { width, height } = frame
  const r = Math.max(0.5, line.widthPx / 2)
  const stamped = new Uint8Array(width * height)
  const stamp = (x: number, y: number) => {
    for (let py = Math.floor(y - r); py <= Math.ceil(y + r); py++) {
      if (py < 0 || py >= height) continue
      for (let px = Math.floor(x - r); px <= Math.ceil(x + r); px++) {
        if (px < 0 || px >= width) continue
        const dx = px + 0.5 - x, dy = py + 0.5 - y
        if (dx * dx + dy * dy > r * r + 0.25) continue
        const p = py * width + px
        if (!stamped[p]) { stamped[p] = 1; blend(data, p * 4, line.colour) }
      }
    }
  }
  for (const positions of line.lines) {
    const pts = positions.map(([lon, lat]) => lonLatToPixel(frame, lon, lat))
    for (let k = 0; k + 1 < pts.length; k++) {
      const [x0, y0] = pts[k]!, [x1, y1] = pts[k + 1]!
      const steps = Math.max(1, Math.ceil(Math.hypot(x1 - x0, y1 - y0) / Math.max(0.5, r / 2)))
      if (steps > 4 * (width + height)) continue // a segment wrapping the world: skip rather than smear
      for (let s = 0; s <= steps; s++) stamp(x0 + ((x1 - x0) * s) / steps, y0 + ((y1 - y0) * s) / steps)
    }
  }
}

/**
 * PNG bytes of RGBA pixels. One row filter (Sub) and a moderate deflate level: class maps are runs
 * of equal pixels, which Sub turns into zeros; trying every filter per row costs ~10× the time for
 * files about half the size (measured in bench/workspace.ts).
 */
export function encodePng(data: Uint8Array, width: number, height: number): Buffer {
  const png = new PNG({ width, height, colorType: 6 })
  png.data = Buffer.from(data.buffer, data.byteOffset, data.byteLength)
  return PNG.sync.write(png, { colorType: 6, filterType: 1, deflateLevel: 4 })
}
