/**
 * One-dimensional complex discrete Fourier transforms of any length, on interleaved
 * Float64Array buffers [re0, im0, re1, im1, …] of length 2n.
 *
 * Forward: X[f] = Σ_t x[t] e^{−2πi f t / n}; inverse: x[t] = (1/n) Σ_f X[f] e^{+2πi f t / n}.
 * Powers of two use fft.js (radix-4). n = r·2^k with a small odd r uses one mixed-radix
 * Cooley–Tukey step (Cooley & Tukey 1965): r transforms of length 2^k, twiddles, then 2^k naive
 * DFTs of length r. Other lengths use Bluestein's chirp-z algorithm (Bluestein 1970).
 */
import FFT from 'fft.js'

export interface ComplexFftPlan {
  readonly n: number
  /** out ← DFT(input); interleaved, length 2n; out and input must be different buffers. */
  forward(out: Float64Array, input: Float64Array): void
  /** out ← inverse DFT(input), including the 1/n factor. */
  inverse(out: Float64Array, input: Float64Array): void
}

/** Largest odd factor handled by the naive mixed-radix step; beyond it Bluestein is cheaper. */
const MAX_NAIVE_ODD = 31

const planCache = new Map<number, ComplexFftPlan>()

/** Returns a (cached) plan for complex transforms of length n ≥ 1. */
export function complexFftPlan(n: number): ComplexFftPlan {
  if (!Number.isInteger(n) || n < 1) throw new Error(`FFT length must be a positive integer, got ${n}`)
  let plan = planCache.get(n)
  if (!plan) {
    plan = makePlan(n)
    planCache.set(n, plan)
  }
  return plan
}

/** Odd part of n (n divided by its largest power-of-two factor). */
export function oddPart(n: number): number {
  let r = n
  while (r % 2 === 0) r /= 2
  return r
}

function makePlan(n: number): ComplexFftPlan {
  if (n === 1) return identityPlan
  if ((n & (n - 1)) === 0) return powerOfTwoPlan(n)
  const r = oddPart(n)
  if (r <= MAX_NAIVE_ODD) return mixedRadixPlan(r, n / r)
  return bluesteinPlan(n)
}

const identityPlan: ComplexFftPlan = {
  n: 1,
  forward(out, input) { out[0] = input[0]!; out[1] = input[1]! },
  inverse(out, input) { out[0] = input[0]!; out[1] = input[1]! },
}

function powerOfTwoPlan(n: number): ComplexFftPlan {
  const f = new FFT(n)
  return {
    n,
    forward(out, input) { f.transform(out, input) },
    inverse(out, input) { f.inverseTransform(out, input) },
  }
}

/**
 * A plan from a forward transform that takes the sign of the imaginary parts (+1 forward, −1 for the
 * conjugated input/output that turns it into an unnormalised inverse).
 */
function planFromConjugateTransform(n: number, transform: (out: Float64Array, input: Float64Array, sign: number) => void): ComplexFftPlan {
  return {
    n,
    forward(out, input) { transform(out, input, 1) },
    inverse(out, input) {
      transform(out, input, -1)
      for (let k = 0; k < 2 * n; k++) out[k]! /= n
    },
  }
}

/** Length n = r·m, r odd, m a power of two (m may be 1). */
function mixedRadixPlan(r: number, m: number): ComplexFftPlan {
  const n = r * m
  const inner = m > 1 ? complexFftPlan(m) : identityPlan
  // cos/sin of 2π q / n for q ∈ [0, n): twiddles ω_n^{t1·f1} and the length-r DFT roots ω_r^{q} = ω_n^{q·m}.
  const cosT = new Float64Array(n), sinT = new Float64Array(n)
  for (let q = 0; q < n; q++) { cosT[q] = Math.cos(2 * Math.PI * q / n); sinT[q] = Math.sin(2 * Math.PI * q / n) }
  const gathered = new Float64Array(2 * m), sub = new Float64Array(2 * n)
  const column = new Float64Array(2 * r)

  function transform(out: Float64Array, input: Float64Array, sign: number): void {
    // Y_{t1}[f1] = Σ_{t2} x[r·t2 + t1] ω_m^{t2 f1}, stored at sub[2(t1·m + f1)].
    for (let t1 = 0; t1 < r; t1++) {
      for (let t2 = 0; t2 < m; t2++) { const s = 2 * (r * t2 + t1); gathered[2 * t2] = input[s]!; gathered[2 * t2 + 1] = sign * input[s + 1]! }
      const target = sub.subarray(2 * t1 * m, 2 * (t1 + 1) * m)
      if (m > 1) inner.forward(target, gathered)
      else { target[0] = gathered[0]!; target[1] = gathered[1]! }
    }
    // X[f1 + m·f2] = Σ_{t1} ω_n^{t1 f1} ω_r^{t1 f2} Y_{t1}[f1]  (computed with the forward sign, conjugated back below).
    for (let f1 = 0; f1 < m; f1++) {
      for (let t1 = 0; t1 < r; t1++) {
        const q = (t1 * f1) % n, c = cosT[q]!, s = -sinT[q]!
        const yr = sub[2 * (t1 * m + f1)]!, yi = sub[2 * (t1 * m + f1) + 1]!
        column[2 * t1] = yr * c - yi * s
        column[2 * t1 + 1] = yr * s + yi * c
      }
      for (let f2 = 0; f2 < r; f2++) {
        let accR = 0, accI = 0
        for (let t1 = 0; t1 < r; t1++) {
          const q = ((t1 * f2) % r) * m, c = cosT[q]!, s = -sinT[q]!
          const vr = column[2 * t1]!, vi = column[2 * t1 + 1]!
          accR += vr * c - vi * s
          accI += vr * s + vi * c
        }
        const o = 2 * (f1 + m * f2)
        out[o] = accR
        out[o + 1] = sign * accI
      }
    }
  }
  return planFromConjugateTransform(n, transform)
}

/** Bluestein: DFT as a convolution with the chirp e^{−iπt²/n}, done with power-of-two FFTs. */
function bluesteinPlan(n: number): ComplexFftPlan {
  let size = 1
  while (size < 2 * n - 1) size *= 2
  const inner = complexFftPlan(size)
  const chirpR = new Float64Array(n), chirpI = new Float64Array(n)
  for (let t = 0; t < n; t++) {
    // t² mod 2n keeps the angle argument exact for large t.
    const a = Math.PI * ((t * t) % (2 * n)) / n
    chirpR[t] = Math.cos(a); chirpI[t] = -Math.sin(a)
  }
  // Spectrum of the conjugate chirp, wrapped symmetrically on the padded length.
  const filter = new Float64Array(2 * size), filterHat = new Float64Array(2 * size)
  for (let t = 0; t < n; t++) {
    filter[2 * t] = chirpR[t]!; filter[2 * t + 1] = -chirpI[t]!
    if (t > 0) { filter[2 * (size - t)] = chirpR[t]!; filter[2 * (size - t) + 1] = -chirpI[t]! }
  }
  inner.forward(filterHat, filter)
  const a = new Float64Array(2 * size), aHat = new Float64Array(2 * size)

  function transform(out: Float64Array, input: Float64Array, sign: number): void {
    a.fill(0)
    for (let t = 0; t < n; t++) {
      const xr = input[2 * t]!, xi = sign * input[2 * t + 1]!
      a[2 * t] = xr * chirpR[t]! - xi * chirpI[t]!
      a[2 * t + 1] = xr * chirpI[t]! + xi * chirpR[t]!
    }
    inner.forward(aHat, a)
    for (let k = 0; k < size; k++) {
      const ar = aHat[2 * k]!, ai = aHat[2 * k + 1]!, fr = filterHat[2 * k]!, fi = filterHat[2 * k + 1]!
      aHat[2 * k] = ar * fr - ai * fi
      aHat[2 * k + 1] = ar * fi + ai * fr
    }
    inner.inverse(a, aHat)
    for (let f = 0; f < n; f++) {
      const cr = a[2 * f]!, ci = a[2 * f + 1]!
      out[2 * f] = cr * chirpR[f]! - ci * chirpI[f]!
      out[2 * f + 1] = sign * (cr * chirpI[f]! + ci * chirpR[f]!)
    }
  }
  return planFromConjugateTransform(n, transform)
}
