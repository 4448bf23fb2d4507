// Small Tessera JSON ensembles ("ensemble-grid/1") made on the fly for upload and queue tests.
import { Xoshiro128 } from '../../shared/numerics/random/xoshiro128'

export function makeEnsembleJson(opts: { nx: number; ny: number; members: number; leads: number; seed: number; variable?: string }): Uint8Array {
  const { nx, ny, members, leads, seed } = opts
  const rng = new Xoshiro128(seed)
  const lon = Array.from({ length: nx }, (_, i) => -30 + 0.2 * i)
  const lat = Array.from({ length: ny }, (_, j) => -47 + 0.2 * j)
  const leadTimes = Array.from({ length: leads }, (_, t) => new Date(Date.UTC(2031, 10, 14, 6 * (t + 1))).toISOString().replace('.000Z', 'Z'))
  const field = () => {
    const a = rng.nextDouble() * 6, b = rng.nextDouble() * 6
    return Array.from({ length: nx * ny }, (_, k) => {
      const i = k % nx, j = Math.floor(k / nx)
      return 15 + 4 * Math.sin(i / 3 + a) * Math.cos(j / 4 + b) + (rng.nextDouble() - 0.5)
    })
  }
  const doc = {
    tessera: 'ensemble-grid/1', variable: opts.variable ?? 'gust', standardName: 'wind_speed_of_gust', units: 'm s-1',
    referenceTime: '2031-11-14T00:00:00Z', leadTimes, grid: { lon, lat },
    members: Array.from({ length: members }, () => Array.from({ length: leads }, field)),
  }
  return new TextEncoder().encode(JSON.stringify(doc))
}
