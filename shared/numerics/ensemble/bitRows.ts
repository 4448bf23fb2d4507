/**
 * Rows of a binary grid packed 32 cells to a word (cell i of a row is bit i & 31 of word i >> 5),
 * with the word shifts and the windowed OR that a disk dilation needs. Working on words makes
 * "is there an event within the chord" 32 cells at a time.
 */

/** dst[w] ← row shifted so that bit i receives bit i + s (toward lower column index); zeros enter. */
export function shiftTowardLow(src: Int32Array, srcOffset: number, dst: Int32Array, dstOffset: number, words: number, s: number): void {
  const q = s >>> 5
  const r = s & 31
  for (let w = 0; w < words; w++) {
    const a = w + q < words ? src[srcOffset + w + q]! : 0
    if (r === 0) { dst[dstOffset + w] = a; continue }
    const b = w + q + 1 < words ? src[srcOffset + w + q + 1]! : 0
    dst[dstOffset + w] = (a >>> r) | (b << (32 - r))
  }
}

/** dst[w] ← row shifted so that bit i receives bit i − s (toward higher column index); zeros enter. */
export function shiftTowardHigh(src: Int32Array, srcOffset: number, dst: Int32Array, dstOffset: number, words: number, s: number): void {
  const q = s >>> 5
  const r = s & 31
  for (let w = words - 1; w >= 0; w--) {
    const a = w - q >= 0 ? src[srcOffset + w - q]! : 0
    if (r === 0) { dst[dstOffset + w] = a; continue }
    const b = w - q - 1 >= 0 ? src[srcOffset + w - q - 1]! : 0
    dst[dstOffset + w] = (a << r) | (b >>> (32 - r))
  }
}

/**
 * One-sided windowed OR into `a`: toward 'low', a bit i = OR of src bits i .. i + length − 1;
 * toward 'high', a bit i = OR of src bits i − length + 1 .. i. Doubling gives 2^k bits in k
 * shifts; two overlapping power-of-two windows cover any length. Bits shifted off the row are
 * cells outside the grid, so nothing real is lost. b is scratch.
 */
function oneSidedWindow(src: Int32Array, srcOffset: number, words: number, length: number, toward: 'low' | 'high', a: Int32Array, b: Int32Array): void {
  const shift = toward === 'low' ? shiftTowardLow : shiftTowardHigh
  for (let w = 0; w < words; w++) a[w] = src[srcOffset + w]!
  let span = 1
  while (2 * span <= length) {
    shift(a, 0, b, 0, words, span)
    for (let w = 0; w < words; w++) a[w]! |= b[w]!
    span *= 2
  }
  if (length > span) {
    shift(a, 0, b, 0, words, length - span)
    for (let w = 0; w < words; w++) a[w]! |= b[w]!
  }
}

/**
 * Centred windowed OR of one packed row: out bit i = OR of bits i − h .. i + h, truncated at the
 * row ends (as the union of the two one-sided windows of length h + 1, so that no edge bit is
 * lost). a, b, c are scratch rows of `words` words.
 */
export function dilateRow(src: Int32Array, srcOffset: number, out: Int32Array, outOffset: number, words: number, h: number,
  a: Int32Array, b: Int32Array, c: Int32Array): void {
  oneSidedWindow(src, srcOffset, words, h + 1, 'low', a, b)
  oneSidedWindow(src, srcOffset, words, h + 1, 'high', c, b)
  for (let w = 0; w < words; w++) out[outOffset + w] = a[w]! | c[w]!
}
