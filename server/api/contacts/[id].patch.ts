import { idParamSchema } from '#shared/schemas/auth'
import { contactUpdateSchema } from '#shared/schemas/distribution'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin', 'duty_lead')
  const { id } = await getValidatedRouterParams(event, idParamSchema.parse)
  const patch = await readValidatedBody(event, contactUpdateSchema.parse)
  return { contact: await updateContact(event, actor, id, patch) }
})
