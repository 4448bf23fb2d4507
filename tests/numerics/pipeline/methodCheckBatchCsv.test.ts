// Batch distribution (methodCheckBatch.ts) and CSV export (io/methodCheckCsv.ts) of method-check reports.
import { describe, expect, it } from 'vitest'
import { distributionOf, summariseBatch } from '../../../shared/numerics/pipeline/methodCheckBatch'
import type { MethodCheckHeadline } from '../../../shared/numerics/pipeline/methodCheckReport'
import { runMethodCheck } from '../../../shared/numerics/pipeline/methodCheck'
import { batchCsv, csvField, methodCheckReportCsv } from '../../../shared/numerics/io/methodCheckCsv'

const headline = (over: Partial<MethodCheckHeadline>): MethodCheckHeadline => ({
  rmseMean: 1, rmseSampleAverage: 1.4, bestBaseline: 'bicubic-bm', rmseBestBaseline: 1.1, crpsSamples: 0.5, maeBestBaseline: 0.8,
  subgridPowerSamples: 1, subgridPowerBestBaseline: 0.3, fssSmallSamples: 0.9, fssSmallBestBaseline: 0.85, spreadSkill: 1, ...over,
})

describe('batch summary', () => {
  it('gives min, median (type 7) and max, ignoring undefined values', () => {
    // numpy.median([4, 1, 3, 2]) = 2.5; numpy.percentile type 7 is numpy's default.
    expect(distributionOf([4, 1, null, 3, 2, NaN])).toEqual({ count: 4, min: 1, median: 2.5, max: 4 })
    expect(distributionOf([null])).toEqual({ count: 0, min: null, median: null, max: null })
  })

  it('counts where the samples (or the mean) beat the best interpolation', () => {
    const s = summariseBatch([
      headline({}),
      headline({ rmseMean: 1.2, crpsSamples: 0.9, subgridPowerSamples: 4, fssSmallSamples: 0.8 }),
      headline({ rmseMean: 0.5, subgridPowerSamples: 0.5, subgridPowerBestBaseline: 2.1 }),
    ])
    expect(s.cases).toBe(3)
    expect(s.wins).toEqual({ meanOnMse: 2, samplesOnCrps: 2, samplesOnSubgridPower: 2, samplesOnSmallFss: 2 })
    expect(s.metrics.find((m) => m.key === 'rmseMean')).toMatchObject({ min: 0.5, median: 1, max: 1.2, count: 3 })
  })
})

describe('CSV export', () => {
  it('quotes fields per RFC 4180', () => {
    expect(csvField('plain')).toBe('plain')
    expect(csvField('a, b')).toBe('"a, b"')
    expect(csvField('say "hi"')).toBe('"say ""hi"""')
    expect(csvField(null)).toBe('')
    expect(csvField(NaN)).toBe('')
    expect(csvField(0.1 + 0.2)).toBe('0.30000000000000004')
  })

  it('writes every score of a report as one tidy row each', () => {
    const nx = 32, plane = Float64Array.from({ length: nx * nx }, (_, k) => Math.sin(k / 7) + 0.01 * (k % nx))
    const r = runMethodCheck({ truth: plane, nx, ny: nx, spacingKm: 3, settings: {
      factor: 4, kernel: 'matern32', givenKernel: { kernel: 'matern32', lengthScale: 4, variance: 1 }, samples: 3, seed: 2,
      thresholds: { kind: 'value', values: [0, 0.5] }, neighbourhoods: [1, 5],
    } })
    const lines = methodCheckReportCsv(r).split('\r\n')
    expect(lines[0]).toBe('section,forecast,threshold,neighbourhood_cells,wavenumber_per_cell,wavelength_km,quantity,value')
    const rows = lines.slice(1, -1).map((l) => l.split(','))
    expect(rows.every((c) => c.length === 8)).toBe(true)
    const bilinearMse = rows.find((c) => c[0] === 'score' && c[1] === 'bilinear' && c[6] === 'mse')!
    expect(Number(bilinearMse[7])).toBe(r.forecasts.find((f) => f.id === 'bilinear')!.mse)
    // 7 forecasts + 3 samples, each: 6 scalars + 2 thresholds × (2 FSS + 4 Brier).
    expect(rows.filter((c) => c[0] === 'score').length).toBe(10 * 6)
    expect(rows.filter((c) => c[0] === 'fss').length).toBe(10 * 2 * 2)
    expect(rows.filter((c) => c[0] === 'rank_histogram').length).toBe(4)
    const ring = rows.find((c) => c[0] === 'spectrum' && c[1] === 'truth')!
    expect(Number(ring[5])).toBeCloseTo(3 / Number(ring[4]), 9) // wavelength = spacing / wavenumber
  })

  it('writes one row per batch case', () => {
    const text = batchCsv([
      { id: 1, name: 'Gusts, b = 8', truth: 'Front, fine', factor: 8, status: 'completed', headline: headline({}) },
      { id: 2, name: 'Queued', truth: 'Front, fine', factor: 4, status: 'queued', headline: null },
    ])
    const lines = text.trimEnd().split('\r\n')
    expect(lines).toHaveLength(3)
    expect(lines[1]).toBe('1,"Gusts, b = 8","Front, fine",8,completed,1,1.4,bicubic-bm,1.1,0.5,0.8,1,0.3,0.9,0.85,1')
    expect(lines[2]).toBe('2,Queued,"Front, fine",4,queued,,,,,,,,,,,')
  })
})
