export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  return { runs: await listRuns(), uploadLimitBytes: maxUploadBytes() }
})
