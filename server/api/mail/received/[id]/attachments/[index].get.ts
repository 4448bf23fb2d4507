import { attachmentParamsSchema } from '#shared/schemas/distribution'

/** An attachment exactly as it arrived (the PDF's bytes, so its SHA-256 can be compared). */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead')
  const { id, index } = await getValidatedRouterParams(event, attachmentParamsSchema.parse)
  const att = await receivedAttachment(id, index)
  const name = (att.filename ?? `attachment-${index + 1}`).replace(/[^\w.\-]+/g, '_')
  setResponseHeaders(event, {
    'content-type': att.contentType === 'application/pdf' ? 'application/pdf' : 'application/octet-stream',
    'content-disposition': `attachment; filename="${name}"`,
    'x-content-sha256': att.sha256,
    'cache-control': 'private, no-store',
  })
  return att.content
})
