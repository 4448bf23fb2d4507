/**
 * Seeded generators for test fixtures only (the product uses shared/numerics/random).
 * mulberry32 (Tommy Ettinger's 32-bit generator, public domain; common practice for small
 * seeded tests) and Box–Muller normals (Box & Muller 1958).
 */
export function uniformSource(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

export function normalSource(seed: number): () => number {
  const u = uniformSource(seed)
  return () => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u())
}

export function randomField(n: number, seed: number, scale = 1): Float64Array {
  const g = normalSource(seed)
  return Float64Array.from({ length: n }, () => scale * g())
}
