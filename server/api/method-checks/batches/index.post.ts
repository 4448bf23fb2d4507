import { createMethodCheckBatchSchema } from '#shared/schemas/methodChecks'

/** Queues every chosen truth × factor as one batch. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  const input = await readValidatedBody(event, createMethodCheckBatchSchema.parse)
  setResponseStatus(event, 201)
  return createMethodCheckBatch(event, user, input)
})
