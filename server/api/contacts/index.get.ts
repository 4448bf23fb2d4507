import { contactListQuerySchema } from '#shared/schemas/distribution'

/** Contacts hold personal addresses: administrators and duty leads only. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead')
  const { organisationId } = await getValidatedQuery(event, contactListQuerySchema.parse)
  return { contacts: await listContacts(organisationId) }
})
