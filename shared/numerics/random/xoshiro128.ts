/**
 * Seeded pseudo-random numbers: xoshiro128** 1.0 (Blackman & Vigna 2018, "Scrambled linear
 * pseudorandom number generators", ACM TOMS 47:36), period 2^128 − 1, 32-bit outputs.
 * The state is filled from the seed with the MurmurHash3 32-bit finaliser applied to a Weyl
 * sequence (a splitmix-style seeder), so nearby seeds give unrelated streams.
 */

const GOLDEN = 0x9e3779b9

/** MurmurHash3's fmix32 (Appleby 2008): a bijective avalanche of a 32-bit integer. */
function fmix32(h: number): number {
  h ^= h >>> 16
  h = Math.imul(h, 0x85ebca6b)
  h ^= h >>> 13
  h = Math.imul(h, 0xc2b2ae35)
  h ^= h >>> 16
  return h >>> 0
}

export class Xoshiro128 {
  private s0: number
  private s1: number
  private s2: number
  private s3: number

  /**
   * `seed`: any safe integer (negative allowed); `stream`: a non-negative integer selecting an
   * independent sub-stream (e.g. the sample index), so stream k can be regenerated on its own.
   */
  constructor(seed: number, stream = 0) {
    if (!Number.isSafeInteger(seed)) throw new Error(`random seed must be a safe integer, got ${seed}`)
    if (!Number.isSafeInteger(stream) || stream < 0) throw new Error(`random stream must be a non-negative integer, got ${stream}`)
    const lo = seed >>> 0
    const hi = Math.floor(seed / 4294967296) >>> 0
    const streamLo = stream >>> 0, streamHi = Math.floor(stream / 4294967296) >>> 0
    let weyl = fmix32(lo ^ fmix32(hi ^ fmix32(streamLo ^ fmix32(streamHi + GOLDEN))))
    const next = () => { weyl = (weyl + GOLDEN) >>> 0; return fmix32(weyl) }
    this.s0 = next(); this.s1 = next(); this.s2 = next(); this.s3 = next()
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1 // the all-zero state is a fixed point
  }

  /** Next uniformly distributed 32-bit unsigned integer. */
  nextUint32(): number {
    const s1 = this.s1
    const result = Math.imul(rotl(Math.imul(s1, 5), 7), 9)
    const t = s1 << 9
    this.s2 ^= this.s0
    this.s3 ^= s1
    this.s1 ^= this.s2
    this.s0 ^= this.s3
    this.s2 ^= t
    this.s3 = rotl(this.s3, 11)
    return result >>> 0
  }

  /** The four 32-bit state words (for inlined generators that write them back with setState). */
  getState(): [number, number, number, number] {
    return [this.s0, this.s1, this.s2, this.s3]
  }

  setState(state: [number, number, number, number]): void {
    [this.s0, this.s1, this.s2, this.s3] = state
  }

  /** Uniform double in [0, 1) with 53 random bits. */
  nextDouble(): number {
    const a = this.nextUint32() >>> 5, b = this.nextUint32() >>> 6
    return (a * 67108864 + b) / 9007199254740992
  }
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k))
}
