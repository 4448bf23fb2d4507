/**
 * Tessera's map colours. Two sequential ramps of our own, each a path through OKLCH
 * (Ottosson 2020, "A perceptual color space for image processing") whose lightness changes
 * monotonically, so the order of the classes survives every form of colour-vision deficiency
 * and greyscale printing (the principle behind ColorBrewer, Harrower & Brewer 2003, and cividis,
 * Nuñez et al. 2018):
 *  - probability: pale straw → amber → brick → deep plum (light = unlikely, dark = likely);
 *  - value (means, percentiles, fields): deep slate blue → teal → pale lime (dark = low, light = high).
 * Colour is never the only cue (WCAG 2.1, 1.4.1): classes carry labels; where two classes meet on
 * the map each side gets a 1-pixel edge in black or white, whichever contrasts more with that
 * side's colour, so the boundary always reaches 3:1 against both classes (1.4.11); label text on a
 * swatch is black or white, whichever contrasts more. Pure black and white guarantee at least
 * √21 ≈ 4.58:1 against any colour, enough for 4.5:1 text (1.4.3).
 */

export type Rgb = [number, number, number]
export type Rgba = [number, number, number, number]

/** A stop of a ramp in OKLCH: L in [0, 1], C (chroma) ≥ 0, h in degrees. */
export interface LchStop { t: number; l: number; c: number; h: number }

/** Probability ramp (t = probability). */
export const PROBABILITY_RAMP: readonly LchStop[] = [
  { t: 0, l: 0.965, c: 0.055, h: 102 },
  { t: 0.3, l: 0.83, c: 0.125, h: 78 },
  { t: 0.55, l: 0.66, c: 0.155, h: 48 },
  { t: 0.8, l: 0.47, c: 0.14, h: 16 },
  { t: 1, l: 0.3, c: 0.1, h: 340 },
]

/** Value ramp (t = position between the smallest and largest value shown). */
export const VALUE_RAMP: readonly LchStop[] = [
  { t: 0, l: 0.3, c: 0.085, h: 268 },
  { t: 0.35, l: 0.5, c: 0.085, h: 228 },
  { t: 0.65, l: 0.7, c: 0.1, h: 178 },
  { t: 1, l: 0.93, c: 0.12, h: 118 },
]

/** Hatching colour of "no scenario" (Tessera ink-950); text and boundaries use pure black and white. */
export const INK: Rgb = [0x0e, 0x18, 0x24]
export const BLACK: Rgb = [0, 0, 0]
export const WHITE: Rgb = [255, 255, 255]

/** WCAG 2.1 thresholds: text 4.5:1 (1.4.3), graphical boundaries 3:1 (1.4.11). */
export const TEXT_CONTRAST = 4.5
export const BOUNDARY_CONTRAST = 3

const DEG = Math.PI / 180

/** sRGB transfer function (IEC 61966-2-1), linear [0, 1] → encoded [0, 1]. */
function encodeSrgb(x: number): number {
  return x <= 0.0031308 ? 12.92 * x : 1.055 * Math.pow(x, 1 / 2.4) - 0.055
}

/** Inverse sRGB transfer function, encoded [0, 1] → linear [0, 1]. */
function decodeSrgb(x: number): number {
  return x <= 0.04045 ? x / 12.92 : Math.pow((x + 0.055) / 1.055, 2.4)
}

/** OKLab → linear sRGB (Ottosson 2020 matrices); components may fall outside [0, 1] when out of gamut. */
export function oklabToLinearSrgb(l: number, a: number, b: number): [number, number, number] {
  const l_ = (l + 0.3963377774 * a + 0.2158037573 * b) ** 3
  const m_ = (l - 0.1055613458 * a - 0.0638541728 * b) ** 3
  const s_ = (l - 0.0894841775 * a - 1.291485548 * b) ** 3
  return [
    4.0767416621 * l_ - 3.3077115913 * m_ + 0.2309699292 * s_,
    -1.2684380046 * l_ + 2.6097574011 * m_ - 0.3413193965 * s_,
    -0.0041960863 * l_ - 0.7034186147 * m_ + 1.707614701 * s_,
  ]
}

/** 8-bit sRGB → OKLab [L, a, b] (Ottosson 2020 matrices; the inverse of oklabToLinearSrgb after encoding). */
export function rgbToOklab(rgb: Rgb | Rgba): [number, number, number] {
  const [r, g, b] = [rgb[0], rgb[1], rgb[2]].map((v) => decodeSrgb(v / 255)) as [number, number, number]
  const l = Math.cbrt(0.4122214708 * r + 0.5363325363 * g + 0.0514459929 * b)
  const m = Math.cbrt(0.2119034982 * r + 0.6806995451 * g + 0.1073969566 * b)
  const s = Math.cbrt(0.0883024619 * r + 0.2817188376 * g + 0.6299787005 * b)
  return [
    0.2104542553 * l + 0.793617785 * m - 0.0040720468 * s,
    1.9779984951 * l - 2.428592205 * m + 0.4505937099 * s,
    0.0259040371 * l + 0.7827717662 * m - 0.808675766 * s,
  ]
}

function inGamut(rgb: [number, number, number]): boolean {
  return rgb.every((v) => v >= -1e-6 && v <= 1 + 1e-6)
}

/**
 * OKLCH → 8-bit sRGB. Out-of-gamut colours keep their lightness and hue and lose chroma
 * (bisection on C), so the ramp's lightness order is never disturbed by clipping.
 */
export function oklchToRgb(l: number, c: number, h: number): Rgb {
  const lab = (chroma: number) => oklabToLinearSrgb(l, chroma * Math.cos(h * DEG), chroma * Math.sin(h * DEG))
  let linear = lab(c)
  if (!inGamut(linear)) {
    let lo = 0, hi = c
    for (let k = 0; k < 30; k++) { const mid = (lo + hi) / 2; if (inGamut(lab(mid))) lo = mid; else hi = mid }
    linear = lab(lo)
  }
  return linear.map((v) => Math.round(255 * encodeSrgb(Math.min(1, Math.max(0, v))))) as Rgb
}

/** The ramp's colour at t ∈ [0, 1] (clamped), interpolating L, C and h linearly between stops. */
export function rampColour(ramp: readonly LchStop[], t: number): Rgb {
  const x = Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0))
  let k = 0
  while (k < ramp.length - 2 && x > ramp[k + 1]!.t) k++
  const a = ramp[k]!, b = ramp[k + 1]!
  const u = b.t === a.t ? 0 : (x - a.t) / (b.t - a.t)
  let dh = b.h - a.h
  if (dh > 180) dh -= 360
  if (dh < -180) dh += 360
  return oklchToRgb(a.l + u * (b.l - a.l), a.c + u * (b.c - a.c), a.h + u * dh)
}

/** WCAG 2.1 relative luminance of an 8-bit sRGB colour. */
export function relativeLuminance(rgb: Rgb | Rgba): number {
  const [r, g, b] = [rgb[0], rgb[1], rgb[2]].map((v) => decodeSrgb(v / 255)) as [number, number, number]
  return 0.2126 * r + 0.7152 * g + 0.0722 * b
}

/** WCAG 2.1 contrast ratio (L1 + 0.05) / (L2 + 0.05), ≥ 1. */
export function contrastRatio(a: Rgb | Rgba, b: Rgb | Rgba): number {
  const la = relativeLuminance(a), lb = relativeLuminance(b)
  return (Math.max(la, lb) + 0.05) / (Math.min(la, lb) + 0.05)
}

/** Black or white, whichever contrasts more with the background (≥ 4.58:1 for any colour): label text on swatches. */
export function labelTextColour(background: Rgb | Rgba): Rgb {
  return contrastRatio(BLACK, background) >= contrastRatio(WHITE, background) ? BLACK : WHITE
}

/** The edge drawn on a class's side of a boundary: black or white, whichever contrasts more with the class. */
export function boundaryColour(classColour: Rgb | Rgba): Rgb {
  return labelTextColour(classColour)
}

export function hexColour(rgb: Rgb | Rgba): string {
  return '#' + [rgb[0], rgb[1], rgb[2]].map((v) => v.toString(16).padStart(2, '0')).join('')
}

/** Colour of a probability class covering (lower, upper]: the ramp at the class's middle. */
export function probabilityClassColour(lower: number, upper: number): Rgb {
  return rampColour(PROBABILITY_RAMP, (lower + upper) / 2)
}

/** How "no scenario" (probability exactly 0) is drawn: sparse diagonal ink hatching over the basemap. */
export const NO_SCENARIO_HATCH = { colour: INK, alpha: 0.45, spacingPx: 7 }

/**
 * Round steps covering [min, max] with about `target` classes: the step is 1, 2, 2.5 or 5 × 10^k
 * and the edges are multiples of it. Returns the class edges (length classes + 1), ascending.
 */
export function niceSteps(min: number, max: number, target = 8): number[] {
  if (!Number.isFinite(min) || !Number.isFinite(max)) throw new Error(`value range must be finite, got [${min}, ${max}]`)
  if (max < min) [min, max] = [max, min]
  if (max === min) { const pad = Math.max(Math.abs(min) * 0.05, 0.5); min -= pad; max += pad }
  const raw = (max - min) / Math.max(1, target)
  const power = Math.pow(10, Math.floor(Math.log10(raw)))
  const step = [1, 2, 2.5, 5, 10].map((f) => f * power).find((s) => s >= raw * 0.999)!
  const first = Math.floor(min / step + 1e-9) * step
  const last = Math.ceil(max / step - 1e-9) * step
  const count = Math.max(1, Math.round((last - first) / step))
  // Rounding away binary noise so labels read 2.5, not 2.4999999.
  const digits = Math.max(0, -Math.floor(Math.log10(step)) + 2)
  return Array.from({ length: count + 1 }, (_, k) => Number((first + k * step).toFixed(digits)))
}

/** Colour of value class k of `classes` (dark = low, light = high). */
export function valueClassColour(k: number, classes: number): Rgb {
  return rampColour(VALUE_RAMP, classes <= 1 ? 0.5 : k / (classes - 1))
}
