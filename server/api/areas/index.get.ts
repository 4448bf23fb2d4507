/** Every saved area of interest (the office shares them), with whether the caller may edit each. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  // The demo scenario brings its stakeholders' areas, added once.
  if (useRuntimeConfig(event).demoMode) await ensureDemoAreas()
  const areas = await listAreas()
  return { areas: areas.map((a) => ({ ...a, canEdit: canEditArea(user, a) })) }
})
