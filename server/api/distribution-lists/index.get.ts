/** Distribution lists with their members (ids) and how many briefings went to each. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  return { lists: await listDistributionLists() }
})
