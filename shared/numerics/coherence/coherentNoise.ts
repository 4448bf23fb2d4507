/**
 * Time-coherent white noise for the engine's samplesFromNoise: at lead t the noise of sample pair p is
 * Σ_s c_{t,s} ε_{p,s} (leadNoiseWeights.ts), each innovation ε_{p,s} a seeded spatial white-noise plane.
 * The noise is keyed by signed cell coordinates relative to the fine window, not by torus index:
 * row/column order 0…n−1 is the window, then alternately the next cell to the right/below and to the
 * left/above (torus index N − 1, N − 2, …). Leads whose fitted length scale gives a different torus
 * size therefore still share the noise of every cell both tori contain, which is all that lies within
 * half a padding of the window; farther cells reach the window only through the tail of the kernel's
 * square root.
 */
import type { WhiteNoiseSource } from '../grf/downscaler'
import { fillStandardNormal } from '../random/normal'
import { Xoshiro128 } from '../random/xoshiro128'
import { DEFAULT_NOISE_TRUNCATION, leadNoiseWeights } from './leadNoiseWeights'

export interface CoherentNoiseSpec {
  /** Seed shared by every lead of one member (e.g. memberNoiseSeed). */
  noiseSeed: number
  /** Lead times in hours (at least up to leadIndex), strictly increasing. */
  leadHours: ArrayLike<number>
  leadIndex: number
  /** Decorrelation time τ, hours. */
  timeScaleHours: number
  truncation?: number
}

const MAX_LEADS = 4096
const MAX_SIDE = 65536
const MAX_PAIRS = 2 ** 24

/** Torus index of each position in the signed order (window first, then right/left alternately). */
export function signedOrder(torusSide: number, windowSide: number): Int32Array {
  const out = new Int32Array(torusSide)
  for (let k = 0; k < torusSide; k++) {
    if (k < windowSide) { out[k] = k; continue }
    const q = (k - windowSide) >> 1
    out[k] = (k - windowSide) % 2 === 0 ? windowSide + q : torusSide - 1 - q
  }
  return out
}

/** Stream of innovation s, plane (0 = re, 1 = im), signed row r of pair p: unique while the limits hold. */
function streamIndex(pair: number, innovation: number, plane: number, row: number): number {
  return ((pair * MAX_LEADS + innovation) * 2 + plane) * MAX_SIDE + row
}

/** A WhiteNoiseSource giving AR(1)-coherent noise for one lead of one member. */
export function coherentWhiteNoise(spec: CoherentNoiseSpec): WhiteNoiseSource & { weights: ReturnType<typeof leadNoiseWeights> } {
  if (!Number.isSafeInteger(spec.noiseSeed)) throw new Error(`noise seed must be a safe integer, got ${spec.noiseSeed}`)
  if (spec.leadIndex >= MAX_LEADS) throw new Error(`at most ${MAX_LEADS} lead times are supported`)
  const w = leadNoiseWeights(spec.leadHours, spec.leadIndex, spec.timeScaleHours, spec.truncation ?? DEFAULT_NOISE_TRUNCATION)
  const source = (pair: number, re: Float64Array, im: Float64Array, tx: number, ty: number, wx: number, wy: number): void => {
    if (pair >= MAX_PAIRS || tx > MAX_SIDE || ty > MAX_SIDE) throw new Error('noise request beyond the supported pairs or torus size')
    const columns = signedOrder(tx, wx), rows = signedOrder(ty, wy)
    const buffer = new Float64Array(tx)
    re.fill(0); im.fill(0)
    for (let s = w.first; s < w.first + w.weights.length; s++) {
      const c = w.weights[s - w.first]!
      for (const [plane, out] of [re, im].entries()) {
        for (let r = 0; r < ty; r++) {
          fillStandardNormal(new Xoshiro128(spec.noiseSeed, streamIndex(pair, s, plane, r)), buffer)
          const base = rows[r]! * tx
          for (let k = 0; k < tx; k++) out[base + columns[k]!]! += c * buffer[k]!
        }
      }
    }
  }
  return Object.assign(source, { weights: w })
}
