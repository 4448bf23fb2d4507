/**
 * Seeded test randomness on the project's generators (xoshiro128** uniforms, ziggurat normals).
 */
import { standardNormal } from '#shared/numerics/random/normal'
import { Xoshiro128 } from '#shared/numerics/random/xoshiro128'

/** Uniform doubles in [0, 1) from a seeded stream. */
export function uniformGenerator(seed: number): () => number {
  const rng = new Xoshiro128(seed)
  return () => rng.nextDouble()
}

/** Standard normal draws from a seeded stream. */
export function normalGenerator(seed: number): () => number {
  const rng = new Xoshiro128(seed)
  return () => standardNormal(rng)
}

/** A stack of n random grids with values rounded to `decimals` (rounding creates ties). */
export function randomStack(seed: number, nx: number, ny: number, n: number, decimals = 1) {
  const z = normalGenerator(seed)
  const f = 10 ** decimals
  const members = Array.from({ length: n }, () => Float64Array.from({ length: nx * ny }, () => Math.round((5 + 3 * z()) * f) / f))
  return { nx, ny, members }
}
