/** Threshold sets per hazard, with the shipped common-practice defaults marked. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  return { hazards: await listHazards() }
})
