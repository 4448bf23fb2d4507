import { z } from 'zod'
import { briefingIdSchema } from '#shared/schemas/briefings'

const querySchema = z.object({ download: z.enum(['0', '1']).optional() })

/** The PDF: a fresh preview for drafts, else the stored copy. Its SHA-256 travels in X-Tessera-Pdf-Sha256. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const { id } = await getValidatedRouterParams(event, briefingIdSchema.parse)
  const { download } = await getValidatedQuery(event, querySchema.parse)
  const { bytes, sha256, row } = await briefingPdfBytes(id)
  const name = `tessera-briefing-${row.seriesId}-v${row.version}${row.status === 'issued' ? '' : `-${row.status}`}.pdf`
  setResponseHeaders(event, {
    'content-type': 'application/pdf',
    'content-disposition': `${download === '1' ? 'attachment' : 'inline'}; filename="${name}"`,
    'x-tessera-pdf-sha256': sha256,
    'x-tessera-lock-version': String(row.lockVersion),
    // The review page shows the PDF in a frame of this site.
    'x-frame-options': 'SAMEORIGIN',
  })
  return bytes
})
