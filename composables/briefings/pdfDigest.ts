/**
 * Fetches a briefing's PDF and computes the SHA-256 of exactly the bytes received, so the approval
 * names the document the duty lead looked at. Without Web Crypto (plain HTTP on a remote host) the
 * server's header value is used and marked as such.
 */
export interface ReviewedPdf { url: string; sha256: string; computedHere: boolean; bytes: number }

export async function fetchPdfForReview(briefingId: number): Promise<ReviewedPdf> {
  const res = await fetch(`/api/briefings/${briefingId}/pdf`, { credentials: 'same-origin' })
  if (!res.ok) {
    let message = `The PDF could not be loaded (${res.status}).`
    try { message = ((await res.json()) as { message?: string }).message ?? message } catch { /* not JSON */ }
    throw new Error(message)
  }
  const buffer = await res.arrayBuffer()
  const header = res.headers.get('x-tessera-pdf-sha256') ?? ''
  let sha256 = header
  let computedHere = false
  if (globalThis.crypto?.subtle) {
    const digest = await crypto.subtle.digest('SHA-256', buffer)
    sha256 = [...new Uint8Array(digest)].map((x) => x.toString(16).padStart(2, '0')).join('')
    computedHere = true
  }
  const url = URL.createObjectURL(new Blob([buffer], { type: 'application/pdf' }))
  return { url, sha256, computedHere, bytes: buffer.byteLength }
}
