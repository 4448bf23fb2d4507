/** Authors, approvers and lists to offer in the archive's filters. */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  return archiveFilterChoices()
})
