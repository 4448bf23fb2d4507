/**
 * The message to show for a failed `$fetch` / `useFetch` call. Server routes answer with an
 * h3 error whose body carries `message` (or `statusMessage`); network failures have neither.
 */
export function apiErrorMessage(error: unknown, fallback = 'Something went wrong. Please try again.'): string {
  if (!error || typeof error !== 'object') return fallback
  const withData = error as { data?: unknown; statusMessage?: unknown; statusCode?: unknown; status?: unknown }
  const data = withData.data as { message?: unknown; statusMessage?: unknown } | undefined
  for (const candidate of [data?.message, data?.statusMessage, withData.statusMessage]) {
    if (typeof candidate === 'string' && candidate.trim() !== '') return candidate
  }
  const status = apiErrorStatus(error)
  if (status === undefined) return 'Tessera could not reach the server. Check your connection and try again.'
  return fallback
}

/** HTTP status of a failed fetch, if the server answered at all. */
export function apiErrorStatus(error: unknown): number | undefined {
  if (!error || typeof error !== 'object') return undefined
  const { statusCode, status } = error as { statusCode?: unknown; status?: unknown }
  if (typeof statusCode === 'number') return statusCode
  if (typeof status === 'number') return status
  return undefined
}
