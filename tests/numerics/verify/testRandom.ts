/**
 * Seeded test randomness on the project's generators (xoshiro128** uniforms, ziggurat normals),
 * shared with the ensemble tests.
 */
import { normalGenerator, uniformGenerator } from '../ensemble/seededRandom'

export { normalGenerator as normalSource, uniformGenerator as uniformSource }

/** n independent N(0, scale²) values from a seeded stream. */
export function randomField(n: number, seed: number, scale = 1): Float64Array {
  const g = normalGenerator(seed)
  return Float64Array.from({ length: n }, () => scale * g())
}
