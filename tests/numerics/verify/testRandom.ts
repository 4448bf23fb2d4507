/**
 * Seeded test randomness on the project's generators (xoshiro128** uniforms, ziggurat normals).
 */
import { standardNormal } from '../../../shared/numerics/random/normal'
import { Xoshiro128 } from '../../../shared/numerics/random/xoshiro128'

export function uniformSource(seed: number): () => number {
  const rng = new Xoshiro128(seed)
  return () => rng.nextDouble()
}

export function normalSource(seed: number): () => number {
  const rng = new Xoshiro128(seed)
  return () => standardNormal(rng)
}

export function randomField(n: number, seed: number, scale = 1): Float64Array {
  const g = normalSource(seed)
  return Float64Array.from({ length: n }, () => scale * g())
}
