/**
 * Axis ticks and scales for the small inline SVG charts of the runs pages (profile likelihood,
 * extent map). Pure functions, no DOM.
 */

/** Maps a data interval onto a pixel interval; `log` maps log10 of the data. */
export interface Scale {
  (value: number): number
  domain: [number, number]
  range: [number, number]
}

/**
 * Pixel coordinates rounded to 1/100 px: server and browser may differ in the last bit of
 * Math.cos or Math.log10, and rounded attributes keep server-rendered SVG equal to the hydrated one.
 */
export function roundPx(value: number): number {
  return Math.round(value * 100) / 100
}

export function linearScale(domain: [number, number], range: [number, number]): Scale {
  const [d0, d1] = domain
  const [r0, r1] = range
  const span = d1 - d0 || 1
  const scale = ((v: number) => roundPx(r0 + ((v - d0) / span) * (r1 - r0))) as Scale
  scale.domain = domain
  scale.range = range
  return scale
}

export function logScale(domain: [number, number], range: [number, number]): Scale {
  const inner = linearScale([Math.log10(domain[0]), Math.log10(domain[1])], range)
  const scale = ((v: number) => inner(Math.log10(v))) as Scale
  scale.domain = domain
  scale.range = range
  return scale
}

/**
 * A "nice" step (1, 2 or 5 × 10^k) giving about `count` intervals over `span`: the raw step is
 * rounded to the nearest of 1, 2, 5, 10 on a log scale (thresholds √2, √10, √50, as in d3's
 * tick rule — common practice).
 */
export function niceStep(span: number, count = 5): number {
  if (!(span > 0) || !Number.isFinite(span)) return 1
  const raw = span / Math.max(1, count)
  const power = 10 ** Math.floor(Math.log10(raw))
  const fraction = raw / power
  const nice = fraction >= Math.sqrt(50) ? 10 : fraction >= Math.sqrt(10) ? 5 : fraction >= Math.SQRT2 ? 2 : 1
  return nice * power
}

/** Multiples of a nice step inside [lo, hi] (inclusive, with rounding slack). */
export function linearTicks(lo: number, hi: number, count = 5): number[] {
  const step = niceStep(hi - lo, count)
  const ticks: number[] = []
  const first = Math.ceil(lo / step - 1e-9) * step
  for (let v = first; v <= hi + step * 1e-9; v += step) ticks.push(Number(v.toPrecision(12)))
  return ticks
}

/**
 * Ticks for a log axis over [lo, hi] (lo > 0): 1-2-5 per decade when the range spans few
 * decades, powers of ten only when it spans many; at least the two ends' decades.
 */
export function logTicks(lo: number, hi: number): number[] {
  if (!(lo > 0) || !(hi > lo)) return lo > 0 ? [lo] : []
  const decades = Math.log10(hi / lo)
  const mantissas = decades > 4 ? [1] : decades > 1.5 ? [1, 2, 5] : [1, 1.5, 2, 3, 5, 7]
  const ticks: number[] = []
  for (let k = Math.floor(Math.log10(lo)); k <= Math.ceil(Math.log10(hi)); k++) {
    for (const m of mantissas) {
      const v = Number((m * 10 ** k).toPrecision(12))
      if (v >= lo * (1 - 1e-9) && v <= hi * (1 + 1e-9)) ticks.push(v)
    }
  }
  // A range narrower than the mantissa steps: label its two ends instead.
  if (ticks.length < 2) return [lo, hi].map((v) => Number(v.toPrecision(3)))
  return ticks
}

/** Widens [lo, hi] by a fraction of its width on each side (or a fraction of |lo| when flat). */
export function padInterval(lo: number, hi: number, fraction = 0.05): [number, number] {
  const width = hi - lo || Math.abs(lo) || 1
  return [lo - width * fraction, hi + width * fraction]
}

/** Pads a positive interval multiplicatively (for log axes). */
export function padLogInterval(lo: number, hi: number, fraction = 0.05): [number, number] {
  const ratio = hi > lo ? hi / lo : 2
  const factor = ratio ** fraction
  return [lo / factor, hi * factor]
}

/** An SVG path through points ("M x y L x y …"), two decimals. */
export function polylinePath(points: [number, number][]): string {
  return points.map(([x, y], k) => `${k === 0 ? 'M' : 'L'}${x.toFixed(2)} ${y.toFixed(2)}`).join(' ')
}

/** A tick label: shortest exact form of a tick value (no trailing zeros) with a true minus sign. */
export function formatTick(value: number): string {
  const text = String(Number(value.toPrecision(10)))
  return text.startsWith('-') ? `−${text.slice(1)}` : text
}
