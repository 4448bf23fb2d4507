/**
 * Seeded test randomness: mulberry32 uniforms (a well-known 32-bit generator, common
 * practice for reproducible tests) and Box–Muller normals (Box & Muller 1958).
 */
export function uniformGenerator(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

/** Standard normal draws from a seeded uniform stream. */
export function normalGenerator(seed: number): () => number {
  const u = uniformGenerator(seed)
  let spare: number | undefined
  return () => {
    if (spare !== undefined) { const s = spare; spare = undefined; return s }
    const u1 = 1 - u()
    const u2 = u()
    const r = Math.sqrt(-2 * Math.log(u1))
    spare = r * Math.sin(2 * Math.PI * u2)
    return r * Math.cos(2 * Math.PI * u2)
  }
}

/** A stack of n random grids with values rounded to `decimals` (rounding creates ties). */
export function randomStack(seed: number, nx: number, ny: number, n: number, decimals = 1) {
  const z = normalGenerator(seed)
  const f = 10 ** decimals
  const members = Array.from({ length: n }, () => Float64Array.from({ length: nx * ny }, () => Math.round((5 + 3 * z()) * f) / f))
  return { nx, ny, members }
}
