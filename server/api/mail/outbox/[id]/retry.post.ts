import { idParamSchema } from '#shared/schemas/auth'

/** Sends a failed (or uncertain) message again; a duty lead or an administrator decides. */
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin', 'duty_lead')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  try {
    return await retryOutboxMessage(id, actor, event)
  } catch (err) {
    if (err instanceof OutboxRetryError) throw createError({ statusCode: err.status, statusMessage: err.status === 404 ? 'Not Found' : 'Conflict', message: err.message })
    throw err
  }
})
