/**
 * What the member pipeline needs from a conditional sampler, for both the stationary engine
 * (grf/downscaler.ts, one window) and the blended regime sampler (regimes/regimeDownscaler.ts, one
 * window per tile): seeded samples, samples from supplied white noise (one source per window), and
 * re-conditioning to changed block-mean targets.
 */
import type { Downscaler, SpectralNoiseSource, WhiteNoiseSource } from '../grf/downscaler'
import type { RegimeDownscaler } from '../regimes/regimeDownscaler'

export interface MemberSampler {
  samples(count: number, seed: number): Float64Array[]
  /** Window 0 is the whole grid for the stationary sampler. */
  samplesFromNoise(count: number, noiseFor: (window: number) => WhiteNoiseSource): Float64Array[]
  /** Stationary engine only: samples from spectral white noise on its torus (see Downscaler). */
  samplesFromSpectralNoise?(count: number, noise: SpectralNoiseSource): Float64Array[]
  /** Stationary engine only: the sampling torus and how often its size was doubled. */
  readonly torus?: { nx: number; ny: number; enlargements: number }
  recondition(fields: Float64Array[], changes: Float64Array[]): Float64Array[]
  readonly diagnostics: object
}

/** The stationary engine as a one-window sampler. */
export function stationarySampler(d: Downscaler): MemberSampler {
  return {
    samples: (count, seed) => d.samples(count, seed),
    samplesFromNoise: (count, noiseFor) => d.samplesFromNoise(count, noiseFor(0)),
    samplesFromSpectralNoise: (count, noise) => d.samplesFromSpectralNoise(count, noise),
    get torus() { const e = d.model.embedding; return { nx: e.nx, ny: e.ny, enlargements: e.enlargements } },
    recondition: (fields, changes) => d.recondition(fields, changes),
    get diagnostics() { return d.diagnostics },
  }
}

/** The regime sampler (already of this shape). */
export function regimeSampler(d: RegimeDownscaler): MemberSampler {
  return d
}
