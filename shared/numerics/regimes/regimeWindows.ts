/**
 * Overlapping windows of a coarse grid and their blending weights, for local stationary fits of a
 * non-stationary field (Fuentes 2002, Biometrika 89:197: the field as a weighted combination of locally
 * stationary processes on a grid of subregions).
 *
 * Along each axis the grid of n coarse cells is cut into K tiles of width S = n/K, centred at
 * c_k = (k + ½)S. Tile k's weight at a block centre x = I + ½ is a trapezoid: 1 on its core, a linear
 * ramp of width T (T ≤ S) across each boundary with a neighbour, so that the K weights sum to 1 everywhere
 * (the first and last tiles extend to the grid edges). The 2-D weight of window (k, l) is the product of
 * the two axis weights, so the windows' weights are a partition of unity, constant within each block.
 * Each window's support (its blocks of positive weight) is extended by a halo of h coarse cells (clamped
 * to the grid) to give the domain that its conditional simulation conditions on, so that the local
 * conditional mean is not degraded by a window edge where the window still has weight. The local
 * parameters are fitted on the window's tile alone, so a neighbouring regime does not leak into them.
 */

/** A rectangle of coarse cells [x0, x1) × [y0, y1). */
export interface CoarseRect { x0: number; x1: number; y0: number; y1: number }

export interface RegimeWindow {
  /** Position in the window grid (column kx, row ky) and index ky·Kx + kx. */
  kx: number
  ky: number
  index: number
  /** The window's own tile: blocks whose centre lies in [kS, (k+1)S) along each axis (weight ≥ ½); local fits use it. */
  tile: CoarseRect
  /** Blocks with positive weight. */
  support: CoarseRect
  /** Support plus halo: the blocks the window's conditional simulation conditions on. */
  domain: CoarseRect
  /** Weight of each block of the support, row-major (x1 − x0)×(y1 − y0). */
  weights: Float64Array
}

export interface RegimeLayout {
  nx: number
  ny: number
  /** Tiles per axis, tile width S and ramp width T (coarse cells), halo h. */
  tilesX: number
  tilesY: number
  spacingX: number
  spacingY: number
  ramp: number
  halo: number
  windows: RegimeWindow[]
}

export interface RegimeLayoutOptions {
  /** Tiles along x and y (default defaultTiles(n) per axis). */
  tilesX?: number
  tilesY?: number
  /** Ramp width as a fraction of the tile width (default 0.5). */
  rampFraction?: number
  /** Halo as a fraction of the tile width (default 0.25). */
  haloFraction?: number
}

/**
 * Default number of tiles along an axis of n coarse cells: one per 16 cells, from 2 to 4, and 1 below
 * 16 cells (a tile must keep enough cells for a local fit: at least ~8 along each axis). Common practice
 * for moving-window estimates, chosen here so that local fits keep at least 64 cells and the extra cost
 * stays within a few times the stationary model.
 */
export function defaultTiles(n: number): number {
  if (n < 16) return 1
  return Math.min(4, Math.max(2, Math.round(n / 16)))
}

/** Axis weights of K trapezoid tiles of width S = n/K with ramp T, at the block centres 0.5 … n − 0.5: [tile][block]. */
export function axisWeights(n: number, tiles: number, ramp: number): Float64Array[] {
  const S = n / tiles
  const out = Array.from({ length: tiles }, () => new Float64Array(n))
  for (let I = 0; I < n; I++) {
    const x = I + 0.5
    // Tile boundaries sit at q·S, q = 1 … K − 1; within T/2 of one, its two tiles share the weight linearly.
    const q = Math.round(x / S), offset = x - q * S
    if (q >= 1 && q <= tiles - 1 && Math.abs(offset) < ramp / 2) {
      const right = 0.5 + offset / ramp
      out[q - 1]![I] = 1 - right
      out[q]![I] = right
    } else {
      out[Math.min(tiles - 1, Math.floor(x / S))]![I] = 1
    }
  }
  return out
}

function extent(w: Float64Array): [number, number] {
  let lo = w.length, hi = 0
  for (let I = 0; I < w.length; I++) if (w[I]! > 0) { lo = Math.min(lo, I); hi = I + 1 }
  return [lo, hi]
}

/** Windows, supports, domains and weights for an nx×ny coarse grid (see the module comment). */
export function regimeLayout(nx: number, ny: number, options: RegimeLayoutOptions = {}): RegimeLayout {
  if (!Number.isInteger(nx) || !Number.isInteger(ny) || nx < 1 || ny < 1) throw new Error(`grid size must be positive integers, got ${nx}×${ny}`)
  const tilesX = options.tilesX ?? defaultTiles(nx), tilesY = options.tilesY ?? defaultTiles(ny)
  if (!Number.isInteger(tilesX) || !Number.isInteger(tilesY) || tilesX < 1 || tilesY < 1 || tilesX > nx || tilesY > ny) {
    throw new Error(`tiles per axis must be integers from 1 to the grid size, got ${tilesX}×${tilesY} for ${nx}×${ny}`)
  }
  const rampFraction = options.rampFraction ?? 0.5, haloFraction = options.haloFraction ?? 0.25
  if (!(rampFraction >= 0 && rampFraction <= 1)) throw new Error(`ramp fraction must be in [0, 1], got ${rampFraction}`)
  if (!(haloFraction >= 0)) throw new Error(`halo fraction must be ≥ 0, got ${haloFraction}`)
  const spacingX = nx / tilesX, spacingY = ny / tilesY
  const spacing = Math.min(spacingX, spacingY)
  const ramp = rampFraction * spacing, halo = Math.ceil(haloFraction * spacing)
  const wx = axisWeights(nx, tilesX, ramp), wy = axisWeights(ny, tilesY, ramp)
  // Block I belongs to tile ⌊(I + ½)/S⌋: tile k covers I ∈ [⌈kS − ½⌉, ⌈(k+1)S − ½⌉).
  const tileStart = (k: number, S: number, n: number): number => Math.min(n, Math.max(0, Math.ceil(k * S - 0.5)))
  const windows: RegimeWindow[] = []
  for (let ky = 0; ky < tilesY; ky++) for (let kx = 0; kx < tilesX; kx++) {
    const [x0, x1] = extent(wx[kx]!), [y0, y1] = extent(wy[ky]!)
    const weights = new Float64Array((x1 - x0) * (y1 - y0))
    for (let J = y0; J < y1; J++) for (let I = x0; I < x1; I++) weights[(J - y0) * (x1 - x0) + I - x0] = wx[kx]![I]! * wy[ky]![J]!
    windows.push({
      kx, ky, index: ky * tilesX + kx,
      tile: { x0: tileStart(kx, spacingX, nx), x1: tileStart(kx + 1, spacingX, nx), y0: tileStart(ky, spacingY, ny), y1: tileStart(ky + 1, spacingY, ny) },
      support: { x0, x1, y0, y1 },
      domain: { x0: Math.max(0, x0 - halo), x1: Math.min(nx, x1 + halo), y0: Math.max(0, y0 - halo), y1: Math.min(ny, y1 + halo) },
      weights,
    })
  }
  return { nx, ny, tilesX, tilesY, spacingX, spacingY, ramp, halo, windows }
}

/** Copies the cells of `rect` out of a row-major nx-wide coarse field. */
export function cropCoarse(field: ArrayLike<number>, nx: number, rect: CoarseRect): Float64Array {
  const w = rect.x1 - rect.x0
  const out = new Float64Array(w * (rect.y1 - rect.y0))
  for (let J = rect.y0; J < rect.y1; J++) for (let I = rect.x0; I < rect.x1; I++) out[(J - rect.y0) * w + I - rect.x0] = field[J * nx + I]!
  return out
}
