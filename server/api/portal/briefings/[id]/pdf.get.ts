import { idParamSchema } from '#shared/schemas/auth'

/** The issued PDF, the same bytes as e-mailed (SHA-256 in X-Tessera-Pdf-Sha256). */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'stakeholder')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  const row = await portalBriefingPdf(user.id, id)
  setResponseHeaders(event, {
    'content-type': 'application/pdf',
    'content-disposition': `inline; filename="tessera-briefing-${row.seriesId}-v${row.version}${row.status === 'issued' ? '' : `-${row.status}`}.pdf"`,
    'x-tessera-pdf-sha256': row.pdfSha256 ?? '',
    'cache-control': 'private, no-store',
  })
  return row.pdf
})
