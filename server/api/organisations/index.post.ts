import { organisationSchema } from '#shared/schemas/distribution'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin', 'duty_lead')
  const input = await readValidatedBody(event, organisationSchema.parse)
  setResponseStatus(event, 201)
  return { organisation: await createOrganisation(event, actor, input) }
})
