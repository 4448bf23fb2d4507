import { createMethodCheckSchema } from '#shared/schemas/methodChecks'

/** Queues a method check of a stored truth field. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const input = await readValidatedBody(event, createMethodCheckSchema.parse)
  setResponseStatus(event, 201)
  return createMethodCheck(event, user, input)
})
