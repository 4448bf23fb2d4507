import { contactSchema } from '#shared/schemas/distribution'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin', 'duty_lead')
  const input = await readValidatedBody(event, contactSchema.parse)
  setResponseStatus(event, 201)
  return { contact: await createContact(event, actor, input) }
})
