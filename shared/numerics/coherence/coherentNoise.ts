/**
 * Time-coherent white noise for the engine's samplesFromNoise: at lead t the noise of sample pair p is
 * Σ_s c_{t,s} ε_{p,s} (leadNoiseWeights.ts), each innovation ε_{p,s} a seeded spatial white-noise plane.
 * The noise is keyed by signed cell coordinates relative to the fine window, not by torus index: each
 * torus row has two streams, one for the window and the cells to its right (torus index 0, 1, …) and
 * one for the cells to its left (torus index N − 1, N − 2, …), and rows are keyed the same way. Leads
 * whose fitted length scale gives a different torus size therefore still share the noise of every cell
 * both tori contain, which is all that lies within half a padding of the window; farther cells reach
 * the window only through the tail of the kernel's square root. The right part of the padding gets
 * ⌈P/2⌉ of its P cells, the left part ⌊P/2⌋ (P = torus side − window side).
 */
import type { SpectralNoiseSource, WhiteNoiseSource } from '../grf/downscaler'
import { fft2d } from '../fft/fft2d'
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
const MAX_PAIRS = 2 ** 21

/** Cells of a torus side in the right part (window included) and in the left part of the padding. */
export function sideSplit(torusSide: number, windowSide: number): { right: number; left: number } {
  const padding = torusSide - windowSide
  return { right: windowSide + Math.ceil(padding / 2), left: Math.floor(padding / 2) }
}

/** Stream of innovation s, plane (0 = re, 1 = im), row key r (2j for row j ≥ 0, 2|j| − 1 above the window) and part (0 = right, 1 = left) of pair p. */
function streamIndex(pair: number, innovation: number, plane: number, rowKey: number, part: number): number {
  return (((pair * MAX_LEADS + innovation) * 2 + plane) * 2 * MAX_SIDE + rowKey) * 2 + part
}

/** A WhiteNoiseSource giving AR(1)-coherent noise for one lead of one member. */
export function coherentWhiteNoise(spec: CoherentNoiseSpec): WhiteNoiseSource & { weights: ReturnType<typeof leadNoiseWeights> } {
  if (!Number.isSafeInteger(spec.noiseSeed)) throw new Error(`noise seed must be a safe integer, got ${spec.noiseSeed}`)
  if (spec.leadIndex >= MAX_LEADS) throw new Error(`at most ${MAX_LEADS} lead times are supported`)
  const w = leadNoiseWeights(spec.leadHours, spec.leadIndex, spec.timeScaleHours, spec.truncation ?? DEFAULT_NOISE_TRUNCATION)
  const source = (pair: number, re: Float64Array, im: Float64Array, tx: number, ty: number, wx: number, wy: number): void => {
    if (pair >= MAX_PAIRS || tx > MAX_SIDE || ty > MAX_SIDE) throw new Error('noise request beyond the supported pairs or torus size')
    const cols = sideSplit(tx, wx), rows = sideSplit(ty, wy)
    const buffer = new Float64Array(tx)
    re.fill(0); im.fill(0)
    for (let s = w.first; s < w.first + w.weights.length; s++) {
      const c = w.weights[s - w.first]!
      for (const [plane, out] of [re, im].entries()) {
        for (let j = 0; j < ty; j++) {
          // Row j of the torus is signed row j (right part) or j − ty (left part).
          const rowKey = j < rows.right ? 2 * j : 2 * (ty - j) - 1
          const base = j * tx
          fillStandardNormal(new Xoshiro128(spec.noiseSeed, streamIndex(pair, s, plane, rowKey, 0)), buffer, 0, cols.right)
          for (let i = 0; i < cols.right; i++) out[base + i]! += c * buffer[i]!
          if (cols.left === 0) continue
          fillStandardNormal(new Xoshiro128(spec.noiseSeed, streamIndex(pair, s, plane, rowKey, 1)), buffer, 0, cols.left)
          for (let q = 0; q < cols.left; q++) out[base + tx - 1 - q]! += c * buffer[q]!
        }
      }
    }
  }
  return Object.assign(source, { weights: w })
}

/**
 * Seed of the spectral innovations of one member on one torus size: tori of different sizes get
 * independent streams (their modes are different frequencies, so nothing could be shared).
 */
function spectralSeed(noiseSeed: number, tx: number, ty: number): number {
  return noiseSeed + 4294967296 * (1 + ((tx * 65599 + ty) % 1048576))
}

/**
 * Spatial coherent noise on any torus that agrees with `spectral` on the reference torus: the spatial
 * noise whose spectrum that is, w = √M · IFFT(ξ) (M = rx·ry; then FFT(w)/√M = ξ, so a lead sampling on
 * the reference torus from w gives exactly the spectral draw), placed by signed cell coordinates on
 * every cell both tori contain; the other cells take the signed-coordinate streams of
 * coherentWhiteNoise. Leads on tori of other sizes (a doubled torus after the positive-definiteness
 * check, or a smaller one for a short length scale) so share the noise of every common cell with the
 * leads drawn in the spectrum. Costs one reference-size inverse FFT per pair on top of the spatial path.
 */
export function coherentNoiseMatchingSpectrum(spec: CoherentNoiseSpec, reference: [number, number]): WhiteNoiseSource & { weights: ReturnType<typeof leadNoiseWeights> } {
  const spectral = coherentSpectralNoise(spec)
  const spatial = coherentWhiteNoise(spec)
  const [rx, ry] = reference
  const source = (pair: number, re: Float64Array, im: Float64Array, tx: number, ty: number, wx: number, wy: number): void => {
    spatial(pair, re, im, tx, ty, wx, wy)
    const wre = new Float64Array(rx * ry), wim = new Float64Array(rx * ry)
    spectral(pair, wre, wim, rx, ry)
    fft2d(wre, wim, rx, ry, true)
    const scale = Math.sqrt(rx * ry)
    const torusColumn = placement(rx, wx, tx), torusRow = placement(ry, wy, ty)
    for (let j = 0; j < ry; j++) {
      const J = torusRow[j]!
      if (J < 0) continue
      for (let i = 0; i < rx; i++) {
        const I = torusColumn[i]!
        if (I < 0) continue
        re[J * tx + I] = scale * wre[j * rx + i]!
        im[J * tx + I] = scale * wim[j * rx + i]!
      }
    }
  }
  return Object.assign(source, { weights: spatial.weights })
}

/** For each index of a side-`from` torus, the index of the same signed coordinate on a side-`to` torus (−1 when outside it). */
function placement(from: number, window: number, to: number): Int32Array {
  const a = sideSplit(from, window), b = sideSplit(to, window)
  return Int32Array.from({ length: from }, (_, i) => {
    const c = i < a.right ? i : i - from
    return c >= 0 ? (c < b.right ? c : -1) : (-c <= b.left ? to + c : -1)
  })
}

/**
 * AR(1)-coherent white noise drawn directly in the torus spectrum (Σ_s c_{t,s} ξ_{p,s}, each ξ a pair of
 * seeded planes of independent standard normals per Fourier mode): for leads that all sample on the same
 * torus, it is the spatial construction above transformed by the (fixed, linear) DFT, so the lead-to-lead
 * correlation is the same, and it saves the forward FFT and the per-row streams. Only leads on one torus
 * size share noise: use it when the torus cannot depend on the fitted length scale.
 */
export function coherentSpectralNoise(spec: CoherentNoiseSpec): SpectralNoiseSource & { weights: ReturnType<typeof leadNoiseWeights> } {
  if (!Number.isSafeInteger(spec.noiseSeed) || spec.noiseSeed < 0 || spec.noiseSeed >= 4294967296) throw new Error(`noise seed must be a 32-bit unsigned integer, got ${spec.noiseSeed}`)
  if (spec.leadIndex >= MAX_LEADS) throw new Error(`at most ${MAX_LEADS} lead times are supported`)
  const w = leadNoiseWeights(spec.leadHours, spec.leadIndex, spec.timeScaleHours, spec.truncation ?? DEFAULT_NOISE_TRUNCATION)
  const source = (pair: number, re: Float64Array, im: Float64Array, tx: number, ty: number): void => {
    if (pair >= MAX_PAIRS || tx > MAX_SIDE || ty > MAX_SIDE) throw new Error('noise request beyond the supported pairs or torus size')
    const buffer = new Float64Array(tx * ty)
    re.fill(0); im.fill(0)
    for (let s = w.first; s < w.first + w.weights.length; s++) {
      const c = w.weights[s - w.first]!
      const rng = new Xoshiro128(spectralSeed(spec.noiseSeed, tx, ty), pair * MAX_LEADS + s)
      for (const out of [re, im]) {
        fillStandardNormal(rng, buffer)
        for (let k = 0; k < buffer.length; k++) out[k]! += c * buffer[k]!
      }
    }
  }
  return Object.assign(source, { weights: w })
}
