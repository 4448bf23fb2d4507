// Re-projection of grids onto the Web-Mercator pixel grid of a map image source.
import { describe, expect, it } from 'vitest'
import proj4 from 'proj4'
import { PNG } from 'pngjs'
import {
  drawLines, encodePng, inverseMercatorY, lonLatToPixel, mercatorFrame, mercatorY, pixelCentre, pixelCellTable, renderClasses, type ImagePalette,
} from '../../../server/utils/productImage'
import { fineGeometry, locateFineCell } from '../../../server/utils/runGeometry'
import type { RunGrid } from '../../../server/db/schema/runs'

const DEG = Math.PI / 180

function latLonGrid(nx: number, ny: number, lon0: number, lat0: number, dlon: number, dlat: number): RunGrid {
  return {
    nx, ny, spacingKm: 20, dxKm: 20, dyKm: 20, crs: 'EPSG:4326', proj4: '+proj=longlat +datum=WGS84 +no_defs',
    x: Array.from({ length: nx }, (_, i) => lon0 + dlon * i), y: Array.from({ length: ny }, (_, j) => lat0 + dlat * j),
    xUnits: 'degrees_east', yUnits: 'degrees_north',
  }
}

describe('Mercator ordinate', () => {
  it('matches the closed form y = asinh(tan φ) (EPSG Guidance Note 7-2, spherical Mercator) and inverts', () => {
    for (const lat of [-80, -45.3, -12, 0, 0.5, 33.3, 60, 85]) {
      expect(mercatorY(lat)).toBeCloseTo(Math.asinh(Math.tan(lat * DEG)), 12)
      expect(inverseMercatorY(mercatorY(lat))).toBeCloseTo(lat, 10)
    }
  })

  it('is clamped at the EPSG:3857 limit, where y = π (the square world)', () => {
    expect(mercatorY(89.9)).toBeCloseTo(Math.PI, 9)
    expect(mercatorY(-90)).toBeCloseTo(-Math.PI, 9)
  })
})

describe('Mercator frame', () => {
  const frame = mercatorFrame([-28, -48.5, -19.7, -42.3], 400)

  it('keeps Mercator\'s aspect ratio and lists the corners top-left first, clockwise', () => {
    const expected = (400 * (Math.asinh(Math.tan(-42.3 * DEG)) - Math.asinh(Math.tan(-48.5 * DEG)))) / (8.3 * DEG)
    expect(frame.height).toBe(Math.round(expected))
    expect(frame.corners).toEqual([[-28, -42.3], [-19.7, -42.3], [-19.7, -48.5], [-28, -48.5]])
  })

  it('pixel centres are evenly spaced in longitude and in Mercator y, and lonLatToPixel inverts them', () => {
    const [lon0, lat0] = pixelCentre(frame, 0, 0)
    const [lon1] = pixelCentre(frame, 1, 0)
    expect(lon1 - lon0).toBeCloseTo(8.3 / 400, 12)
    expect(lon0).toBeCloseTo(-28 + 0.5 * 8.3 / 400, 12)
    const ys = [0, 1, 2, frame.height - 1].map((py) => mercatorY(pixelCentre(frame, 0, py)[1]))
    expect(ys[0]! - ys[1]!).toBeCloseTo(ys[1]! - ys[2]!, 12)
    expect(lat0).toBeLessThan(-42.3)
    for (const [px, py] of [[0, 0], [17, 203], [399, frame.height - 1]] as const) {
      const [x, y] = lonLatToPixel(frame, ...pixelCentre(frame, px, py))
      expect(x).toBeCloseTo(px + 0.5, 9)
      expect(y).toBeCloseTo(py + 0.5, 9)
    }
  })

  it('handles bounds across the 180° line (east given as a negative longitude)', () => {
    const f = mercatorFrame([170, -10, -170, 10], 200)
    expect(f.east).toBe(190)
    expect(pixelCentre(f, 199, 0)[0]).toBeCloseTo(190 - 0.05, 9)
  })
})

describe('pixel → cell table', () => {
  it('on a lat-lon grid every pixel centre lies inside the cell it is given (brute-force check)', () => {
    const grid = latLonGrid(6, 5, -25, -46, 0.26, 0.19)
    const g = fineGeometry(grid, 4)
    const frame = mercatorFrame([g.xEdges[0]! - 0.1, g.yEdges[0]! - 0.1, g.xEdges[g.nx]! + 0.1, g.yEdges[g.ny]! + 0.1], 150)
    const table = pixelCellTable(frame, (lon, lat) => locateFineCell(g, lon, lat))
    let inside = 0
    for (let py = 0; py < frame.height; py++) for (let px = 0; px < frame.width; px++) {
      const [lon, lat] = pixelCentre(frame, px, py)
      // Independent: scan every fine cell's edges.
      let expected = -1
      for (let j = 0; j < g.ny && expected < 0; j++) for (let i = 0; i < g.nx; i++) {
        if (lon >= g.xEdges[i]! && lon < g.xEdges[i + 1]! && lat >= g.yEdges[j]! && lat < g.yEdges[j + 1]!) { expected = j * g.nx + i; break }
      }
      expect(table[py * frame.width + px]).toBe(expected)
      if (expected >= 0) inside++
    }
    expect(inside).toBeGreaterThan(0.7 * frame.width * frame.height)
  })

  it('row j = 0 of the grid (southernmost) shows at the bottom of the image', () => {
    const g = fineGeometry(latLonGrid(4, 4, 10, 50, 1, 1), 2)
    const frame = mercatorFrame([g.xEdges[0]!, g.yEdges[0]!, g.xEdges[g.nx]!, g.yEdges[g.ny]!], 64)
    const table = pixelCellTable(frame, (lon, lat) => locateFineCell(g, lon, lat))
    expect(Math.floor(table[(frame.height - 1) * frame.width]! / g.nx)).toBe(0)
    expect(Math.floor(table[0]! / g.nx)).toBe(g.ny - 1)
  })

  it('on a Lambert conformal grid each pixel maps to the cell holding its projected centre (proj4 directly)', () => {
    const lcc = '+proj=lcc +lat_1=-40 +lat_2=-50 +lat_0=-45 +lon_0=-23 +x_0=0 +y_0=0 +units=m +R=6371229 +no_defs'
    const grid: RunGrid = {
      nx: 5, ny: 4, spacingKm: 25, dxKm: 25, dyKm: 25, crs: 'lambert_conformal_conic', proj4: lcc,
      x: Array.from({ length: 5 }, (_, i) => -50_000 + 25_000 * i), y: Array.from({ length: 4 }, (_, j) => -40_000 + 25_000 * j), xUnits: 'm', yUnits: 'm',
    }
    const g = fineGeometry(grid, 3)
    const toNative = proj4(lcc, '+proj=longlat +R=6371229 +no_defs')
    const frame = mercatorFrame([-24.2, -45.8, -21.7, -44.1], 120)
    const table = pixelCellTable(frame, (lon, lat) => locateFineCell(g, lon, lat))
    let hits = 0
    for (let p = 0; p < table.length; p += 7) {
      const [lon, lat] = pixelCentre(frame, p % frame.width, Math.floor(p / frame.width))
      const [x, y] = toNative.inverse([lon, lat])
      const i = Math.floor((x - (-62_500)) / (25_000 / 3)), j = Math.floor((y - (-52_500)) / (25_000 / 3))
      const expected = i >= 0 && i < 15 && j >= 0 && j < 12 ? j * 15 + i : -1
      expect(table[p]).toBe(expected)
      if (expected >= 0) hits++
    }
    expect(hits).toBeGreaterThan(50)
  })
})

describe('rendering', () => {
  const frame = mercatorFrame([0, 0, 4, 4], 40)
  // Four columns of cells: class 0 (hatched), 1, 2, and −1 (missing) on the right.
  const table = Int32Array.from({ length: frame.width * frame.height }, (_, p) => Math.floor((p % frame.width) / 10))
  const classOfCell = Int16Array.from([0, 1, 2, -1])
  const palette: ImagePalette = {
    colours: [[255, 255, 255, 255], [250, 230, 160, 255], [120, 30, 60, 255]],
    hatched: new Map([[0, [14, 24, 36, 115]]]),
    hatchSpacingPx: 5,
  }

  it('fills classes, hatches "no scenario", leaves missing cells transparent, and draws class boundaries', () => {
    const data = renderClasses({ frame, table, classOfCell, palette, boundaries: true })
    const px = (x: number, y: number) => Array.from(data.subarray((y * frame.width + x) * 4, (y * frame.width + x) * 4 + 4))
    expect(px(15, 3)).toEqual([250, 230, 160, 255])
    expect(px(25, 3)).toEqual([120, 30, 60, 255])
    expect(px(35, 3)[3]).toBe(0)
    // Hatching: only pixels on the diagonals (x + y) % 5 = 0 are drawn.
    expect(px(5, 0)[3]).toBe(115)
    expect(px(6, 0)[3]).toBe(0)
    // Boundary between class 1 (light) and 2 (dark): black on the light side, white on the dark side.
    expect(px(19, 3)).toEqual([0, 0, 0, 255])
    expect(px(20, 3)).toEqual([255, 255, 255, 255])
    expect(px(18, 3)).toEqual([250, 230, 160, 255])
    // No boundary against the transparent (missing) column.
    expect(px(29, 3)).toEqual([120, 30, 60, 255])
  })

  it('draws lines given in lon/lat onto the right pixels, and encodes a PNG pngjs reads back', () => {
    const data = renderClasses({ frame, table: new Int32Array(table.length).fill(-1), classOfCell, palette, background: [255, 255, 255] })
    const lat = pixelCentre(frame, 0, 20)[1]
    drawLines(data, frame, { lines: [[[0, lat], [4, lat]]], colour: [0, 0, 0, 255], widthPx: 1 })
    const row = (y: number) => Array.from({ length: frame.width }, (_, x) => data[(y * frame.width + x) * 4]!)
    expect(row(20).every((v) => v === 0)).toBe(true)
    expect(row(10).every((v) => v === 255)).toBe(true)
    const decoded = PNG.sync.read(encodePng(data, frame.width, frame.height))
    expect([decoded.width, decoded.height]).toEqual([frame.width, frame.height])
    expect(Buffer.compare(decoded.data, Buffer.from(data))).toBe(0)
  })
})

describe('briefing pictures', () => {
  it('draw the product over an opaque background with the grid outline and an area ring', async () => {
    const { runPlacement } = await import('../../../server/utils/runSamples')
    const { pictureLines } = await import('../../../server/utils/products')
    const placement = runPlacement({ id: 77, grid: latLonGrid(4, 4, 10, 50, 1, 1), settings: { factor: 2, samplesPerMember: 1, kernel: 'se', seed: 1 } })
    const frame = mercatorFrame(placement.bounds, 80)
    const table = pixelCellTable(frame, (lon, lat) => locateFineCell(placement.geometry, lon, lat))
    const area = { geometry: { coordinates: [[[[10.6, 50.6], [12.4, 50.6], [12.4, 52.4], [10.6, 52.4], [10.6, 50.6]]]] } }
    const data = renderClasses({
      frame, table, classOfCell: new Int16Array(64).fill(0), palette: { colours: [[200, 200, 200, 255]] },
      background: [255, 255, 255], lines: pictureLines(placement, [area]),
    })
    const px = (lon: number, lat: number) => { const [x, y] = lonLatToPixel(frame, lon, lat); const o = (Math.floor(y) * frame.width + Math.floor(x)) * 4; return Array.from(data.subarray(o, o + 4)) }
    expect(px(11.5, 50.6)).toEqual([14, 24, 36, 255])
    expect(px(11.5, 51.5)).toEqual([200, 200, 200, 255])
    expect(data[3]).toBe(255)
  })
})
