// The map colour scales: conversions against published values, and the contrast rules of WCAG 2.1.
import { describe, expect, it } from 'vitest'
import {
  BOUNDARY_CONTRAST, boundaryColour, contrastRatio, hexColour, labelTextColour, niceSteps, oklchToRgb, PROBABILITY_RAMP, rampColour,
  relativeLuminance, rgbToOklab, TEXT_CONTRAST, VALUE_RAMP, valueClassColour, type Rgb,
} from '../../../shared/utils/colourScale'
import { classesForEnsemble, probabilityDisplayClasses, valueDisplayClasses } from '../../../server/utils/products'

const hex = (h: string): Rgb => [parseInt(h.slice(1, 3), 16), parseInt(h.slice(3, 5), 16), parseInt(h.slice(5, 7), 16)]
const linear = (v: number) => { const x = v / 255; return x <= 0.04045 ? x / 12.92 : ((x + 0.055) / 1.055) ** 2.4 }

// Colour-vision-deficiency simulation matrices, severity 1.0, applied to linear RGB
// (Machado, Oliveira & Fernandes 2009, IEEE TVCG 15:1291; values from memory of the paper's table).
const CVD: Record<string, number[][]> = {
  protanopia: [[0.152286, 1.052583, -0.204868], [0.114503, 0.786281, 0.099216], [-0.003882, -0.048116, 1.051998]],
  deuteranopia: [[0.367322, 0.860646, -0.227968], [0.280085, 0.672501, 0.047413], [-0.01182, 0.04294, 0.968881]],
  tritanopia: [[1.255528, -0.076749, -0.178779], [-0.078411, 0.930809, 0.147602], [0.004733, 0.691367, 0.3039]],
}
function simulatedLuminance(rgb: Rgb, matrix: number[][]): number {
  const l = rgb.map(linear)
  const s = matrix.map((row) => Math.min(1, Math.max(0, row[0]! * l[0]! + row[1]! * l[1]! + row[2]! * l[2]!)))
  return 0.2126 * s[0]! + 0.7152 * s[1]! + 0.0722 * s[2]!
}

describe('colour conversions', () => {
  it('OKLCH of sRGB red from the CSS Color 4 specification, oklch(62.8% 0.2577 29.23), gives #ff0000 (±2 per channel)', () => {
    const [r, g, b] = oklchToRgb(0.62796, 0.25768, 29.2339)
    expect(r).toBeGreaterThanOrEqual(253)
    expect(g).toBeLessThanOrEqual(2)
    expect(b).toBeLessThanOrEqual(2)
  })

  it('OKLab white and black are sRGB white and black', () => {
    expect(oklchToRgb(1, 0, 0)).toEqual([255, 255, 255])
    expect(oklchToRgb(0, 0, 0)).toEqual([0, 0, 0])
  })

  it('WCAG 2.1 contrast: black on white 21:1; #767676 on white 4.54:1 (the value WebAIM\'s checker reports; from memory)', () => {
    expect(contrastRatio([0, 0, 0], [255, 255, 255])).toBeCloseTo(21, 9)
    expect(contrastRatio(hex('#767676'), [255, 255, 255])).toBeCloseTo(4.54, 2)
    expect(relativeLuminance([255, 255, 255])).toBeCloseTo(1, 12)
  })

  it('a colour out of gamut keeps its OKLab lightness and hue: chroma is reduced, never clipped per channel', () => {
    const [l, a, b] = rgbToOklab(oklchToRgb(0.7, 0.4, 140))
    expect(l).toBeCloseTo(0.7, 2)
    expect(Math.atan2(b, a) * 180 / Math.PI).toBeCloseTo(140, 0)
    expect(Math.hypot(a, b)).toBeLessThan(0.4)
  })

  it('OKLab → sRGB → OKLab returns the same colour for in-gamut colours (to 8-bit rounding)', () => {
    for (const [l, c, h] of [[0.5, 0.1, 30], [0.9, 0.05, 200], [0.3, 0.08, 300]] as const) {
      const [l2, a2, b2] = rgbToOklab(oklchToRgb(l, c, h))
      expect(l2).toBeCloseTo(l, 2)
      expect(a2).toBeCloseTo(c * Math.cos(h * Math.PI / 180), 2)
      expect(b2).toBeCloseTo(c * Math.sin(h * Math.PI / 180), 2)
    }
  })
})

describe('ramps', () => {
  const samples = (ramp: typeof PROBABILITY_RAMP) => Array.from({ length: 101 }, (_, k) => rampColour(ramp, k / 100))

  // Probability: light → dark (luminance falls); values: dark → light (luminance rises).
  for (const [name, ramp, sign] of [['probability', PROBABILITY_RAMP, -1], ['value', VALUE_RAMP, 1]] as const) {
    it(`the ${name} ramp changes luminance strictly monotonically, also as seen with each colour-vision deficiency`, () => {
      const colours = samples(ramp)
      const views: [string, (c: Rgb) => number][] = [['normal vision', relativeLuminance], ...Object.entries(CVD).map(([n, m]) => [n, (c: Rgb) => simulatedLuminance(c, m)] as [string, (c: Rgb) => number])]
      for (const [view, lum] of views) {
        for (let k = 1; k < colours.length; k++) expect(sign * (lum(colours[k]!) - lum(colours[k - 1]!)), `${view} at ${k}`).toBeGreaterThan(0)
      }
    })
  }

  it('ends of the probability ramp span most of the lightness range (≥ 10:1 between them)', () => {
    expect(contrastRatio(rampColour(PROBABILITY_RAMP, 0.05), rampColour(PROBABILITY_RAMP, 0.95))).toBeGreaterThan(10)
  })
})

describe('contrast rules of the legend and map', () => {
  const memberCounts = [1, 2, 3, 4, 5, 7, 10, 18, 51]
  for (const members of memberCounts) {
    it(`probability classes for ${members} members × 10 samples: labels ≥ 4.5:1, each side's boundary edge ≥ 3:1 against its class`, () => {
      const classes = probabilityDisplayClasses(classesForEnsemble(members * 10, members))
      for (const c of classes) expect(contrastRatio(hex(c.colour), hex(c.textColour))).toBeGreaterThanOrEqual(TEXT_CONTRAST)
      const filled = classes.filter((c) => !c.hatched)
      for (const c of filled) expect(contrastRatio(boundaryColour(hex(c.colour)), hex(c.colour)), c.label).toBeGreaterThanOrEqual(BOUNDARY_CONTRAST)
      // Classes are distinct colours, and "no scenario" is hatched, not a fill of its own.
      expect(new Set(filled.map((c) => c.colour)).size).toBe(filled.length)
      expect(classes.filter((c) => c.hatched).map((c) => c.noScenario)).toEqual([true])
    })
  }

  it('value classes: labels ≥ 4.5:1 and boundary edges ≥ 3:1 against their class', () => {
    for (const [min, max] of [[-7.3, 4.1], [0, 37], [3.2, 27.9]] as const) {
      const classes = valueDisplayClasses(min, max, 'u')
      for (const c of classes) expect(contrastRatio(hex(c.colour), hex(c.textColour))).toBeGreaterThanOrEqual(TEXT_CONTRAST)
      for (const c of classes) expect(contrastRatio(boundaryColour(hex(c.colour)), hex(c.colour))).toBeGreaterThanOrEqual(BOUNDARY_CONTRAST)
    }
  })

  it('black or white reaches at least √21 ≈ 4.58:1 against any colour (why labels and edges use them)', () => {
    for (let v = 0; v < 4096; v++) {
      const c: Rgb = [(v & 15) * 17, ((v >> 4) & 15) * 17, ((v >> 8) & 15) * 17]
      expect(contrastRatio(labelTextColour(c), c)).toBeGreaterThanOrEqual(Math.sqrt(21) - 0.01)
    }
  })

  it('label text is black on light swatches and white on dark ones', () => {
    expect(hexColour(labelTextColour(rampColour(PROBABILITY_RAMP, 0.05)))).toBe('#000000')
    expect(hexColour(labelTextColour(rampColour(PROBABILITY_RAMP, 0.98)))).toBe('#ffffff')
    expect(hexColour(labelTextColour(valueClassColour(0, 8)))).toBe('#ffffff')
  })
})

describe('round value steps', () => {
  it('cover the range with steps of 1, 2, 2.5 or 5 × 10^k and about the target number of classes', () => {
    for (const [min, max] of [[3.2, 27.9], [-7.3, 4.1], [0, 0.37], [1013.2, 1013.9], [-40, 45]] as const) {
      const edges = niceSteps(min, max, 8)
      const step = edges[1]! - edges[0]!
      expect(edges[0]).toBeLessThanOrEqual(min)
      expect(edges[edges.length - 1]).toBeGreaterThanOrEqual(max)
      const mantissa = step / 10 ** Math.floor(Math.log10(step) + 1e-9)
      expect([1, 2, 2.5, 5].some((f) => Math.abs(mantissa - f) < 1e-6)).toBe(true)
      expect(edges.length - 1).toBeGreaterThanOrEqual(4)
      expect(edges.length - 1).toBeLessThanOrEqual(12)
    }
  })

  it('a constant field still gets a class around its value', () => {
    const edges = niceSteps(5, 5)
    expect(edges[0]).toBeLessThan(5)
    expect(edges[edges.length - 1]).toBeGreaterThan(5)
  })
})
