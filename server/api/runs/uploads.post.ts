import { uploadQuerySchema } from '#shared/schemas/runs'

/** Raw file body (application/octet-stream), streamed to storage; answers the preview. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'forecaster')
  const { fileName } = await getValidatedQuery(event, uploadQuerySchema.parse)
  setResponseStatus(event, 201)
  return stageUpload(event, user, fileName)
})
