import { truthUploadQuerySchema } from '#shared/schemas/methodChecks'

/** Raw file body (application/octet-stream); ?fileName=…&member=0&lead=0 choose the field kept as the truth. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const query = await getValidatedQuery(event, truthUploadQuerySchema.parse)
  setResponseStatus(event, 201)
  return uploadMethodCheckTruth(event, user, query)
})
