/**
 * Standard normal variates by the ziggurat method (Marsaglia & Tsang 2000, J. Stat. Softw. 5(8)),
 * 128 layers, with the layer index and the 53-bit uniform taken from separate random bits
 * (the correction Doornik 2005 recommends over reusing the low bits of one integer).
 * Tail beyond r by Marsaglia's (1964) exponential rejection method.
 */
import { Xoshiro128 } from './xoshiro128'

const LAYERS = 128
/** Right edge of the base layer and common layer area, from Marsaglia & Tsang (2000), 128 layers. */
const R = 3.442619855899
const V = 9.91256303526217e-3

/** x[i]: right edge of layer i (x[0] is the base layer's equivalent width V/f(R)); x[128] = 0. */
const edge = new Float64Array(LAYERS + 1)
/** f(x[i]) with f(x) = exp(−x²/2). */
const height = new Float64Array(LAYERS + 1)
edge[0] = V / Math.exp(-0.5 * R * R)
edge[1] = R
for (let i = 2; i < LAYERS; i++) {
  const prev = edge[i - 1]!
  edge[i] = Math.sqrt(-2 * Math.log(Math.exp(-0.5 * prev * prev) + V / prev))
}
edge[LAYERS] = 0
for (let i = 0; i <= LAYERS; i++) height[i] = Math.exp(-0.5 * edge[i]! * edge[i]!)
/** Ratio x[i+1]/x[i]: |u| below it is inside the layer's rectangle under the curve (fast path). */
const inner = new Float64Array(LAYERS)
for (let i = 0; i < LAYERS; i++) inner[i] = edge[i + 1]! / edge[i]!

const TWO_POW_M52 = 2 ** -52

/** One standard normal variate from `rng`. */
export function standardNormal(rng: Xoshiro128): number {
  for (;;) {
    const a = rng.nextUint32(), b = rng.nextUint32()
    const i = a & (LAYERS - 1)
    // 25 + 28 = 53 bits → u uniform in [−1, 1).
    const u = ((a >>> 7) * 268435456 + (b >>> 4)) * TWO_POW_M52 - 1
    if (Math.abs(u) < inner[i]!) return u * edge[i]!
    if (i === 0) return u < 0 ? -normalTail(rng) : normalTail(rng)
    const x = u * edge[i]!
    const y = height[i]! + rng.nextDouble() * (height[i + 1]! - height[i]!)
    if (y < Math.exp(-0.5 * x * x)) return x
  }
}

function normalTail(rng: Xoshiro128): number {
  for (;;) {
    const a = -Math.log(1 - rng.nextDouble()) / R
    const b = -Math.log(1 - rng.nextDouble())
    if (b + b >= a * a) return R + a
  }
}

/**
 * Fills out[offset … offset+count) with independent standard normal variates: the same values, in the
 * same order, as repeated standardNormal(rng), with the generator inlined on the fast path (≈ 99 % of
 * draws) for speed.
 */
export function fillStandardNormal(rng: Xoshiro128, out: Float64Array, offset = 0, count = out.length - offset): Float64Array {
  const end = offset + count
  let [s0, s1, s2, s3] = rng.getState()
  for (let k = offset; k < end; k++) {
    // Two xoshiro128** outputs, as in Xoshiro128.nextUint32.
    let x = Math.imul(s1, 5)
    const a = Math.imul((x << 7) | (x >>> 25), 9) >>> 0
    let t = s1 << 9
    s2 ^= s0; s3 ^= s1; s1 ^= s2; s0 ^= s3; s2 ^= t; s3 = (s3 << 11) | (s3 >>> 21)
    x = Math.imul(s1, 5)
    const b = Math.imul((x << 7) | (x >>> 25), 9) >>> 0
    t = s1 << 9
    s2 ^= s0; s3 ^= s1; s1 ^= s2; s0 ^= s3; s2 ^= t; s3 = (s3 << 11) | (s3 >>> 21)
    const i = a & (LAYERS - 1)
    const u = ((a >>> 7) * 268435456 + (b >>> 4)) * TWO_POW_M52 - 1
    if (Math.abs(u) < inner[i]!) { out[k] = u * edge[i]!; continue }
    // Rare path: hand the state back, finish this variate with the generic code, take the state again.
    rng.setState([s0, s1, s2, s3])
    out[k] = finishVariate(rng, i, u)
    ;[s0, s1, s2, s3] = rng.getState()
  }
  rng.setState([s0, s1, s2, s3])
  return out
}

/** Completes a variate whose first uniform u (layer i) missed the fast path; continues like standardNormal. */
function finishVariate(rng: Xoshiro128, i: number, u: number): number {
  if (i === 0) return u < 0 ? -normalTail(rng) : normalTail(rng)
  const x = u * edge[i]!
  const y = height[i]! + rng.nextDouble() * (height[i + 1]! - height[i]!)
  if (y < Math.exp(-0.5 * x * x)) return x
  return standardNormal(rng)
}
