/**
 * Axes of the method-check charts, on the runs pages' scale and tick helpers
 * (composables/runs/chartAxes.ts): domains widened to whole steps (linear) or whole decades (log),
 * labels that switch to powers of ten for extreme values (spectral power spans many decades), and
 * line paths that break at missing values. Pure, no DOM.
 */
import { formatTick, linearScale, linearTicks, logScale, logTicks, niceStep, roundPx } from '../runs/chartAxes'

export interface Tick { value: number; label: string }

export interface AxisScale {
  log: boolean
  domain: [number, number]
  range: [number, number]
  /** Data value → pixel position (rounded so server and browser render the same SVG). */
  at: (value: number) => number
  ticks: Tick[]
}

/** A tick label: the runs charts' form, or m×10^e beyond [10⁻³, 10⁵). */
export function tickLabel(v: number): string {
  const a = Math.abs(v)
  if (v !== 0 && (a >= 1e5 || a < 1e-3)) {
    const e = Math.floor(Math.log10(a) + 1e-12)
    const m = Number((v / 10 ** e).toPrecision(2))
    return `${m === 1 ? '' : `${formatTick(m)}×`}10^${e}`
  }
  return formatTick(Number(v.toPrecision(3)))
}

/** Scale over the extent, widened to whole 1-2-5 steps (linear) or whole decades (log, positive extents). */
export function axisScale(extent: [number, number], range: [number, number], log: boolean, label: (v: number) => string = tickLabel): AxisScale {
  let [lo, hi] = extent
  if (log) {
    let a = Math.floor(Math.log10(lo) + 1e-9), b = Math.ceil(Math.log10(hi) - 1e-9)
    if (!(b > a)) b = a + 1
    lo = Number((10 ** a).toPrecision(12)); hi = Number((10 ** b).toPrecision(12))
    const s = logScale([lo, hi], range)
    return { log, domain: [lo, hi], range, at: s, ticks: logTicks(lo, hi).map((v) => ({ value: v, label: label(v) })) }
  }
  if (!(hi > lo)) { lo -= 0.5; hi += 0.5 }
  const step = niceStep(hi - lo)
  lo = Number((Math.floor(lo / step + 1e-9) * step).toPrecision(12))
  hi = Number((Math.ceil(hi / step - 1e-9) * step).toPrecision(12))
  const s = linearScale([lo, hi], range)
  return { log, domain: [lo, hi], range, at: s, ticks: linearTicks(lo, hi).map((v) => ({ value: v, label: label(v) })) }
}

/** The extent of the finite values (positive ones only for a log axis), or null when there are none. */
export function extentOf(values: Iterable<number>, log: boolean): [number, number] | null {
  let lo = Infinity, hi = -Infinity
  for (const v of values) {
    if (!Number.isFinite(v) || (log && v <= 0)) continue
    if (v < lo) lo = v
    if (v > hi) hi = v
  }
  return lo <= hi ? [lo, hi] : null
}

/** SVG path through the points, lifting the pen where a point is missing (null) or off a log axis. */
export function linePath(points: readonly (readonly [number, number] | null)[], x: AxisScale, y: AxisScale): string {
  let d = ''
  let pen = false
  for (const p of points) {
    const ok = p !== null && Number.isFinite(p[0]) && Number.isFinite(p[1]) && (!x.log || p[0] > 0) && (!y.log || p[1] > 0)
    if (!ok) { pen = false; continue }
    d += `${pen ? 'L' : 'M'}${roundPx(x.at(p![0]))},${roundPx(y.at(p![1]))}`
    pen = true
  }
  return d
}
