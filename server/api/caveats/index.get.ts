export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  return { caveats: await listCaveats(true) }
})
