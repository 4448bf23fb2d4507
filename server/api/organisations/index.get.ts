/** Stakeholder organisations (staff: forecasters see whom briefings go to). */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  return { organisations: await listOrganisations() }
})
