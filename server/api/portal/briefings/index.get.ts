/** The stakeholder's briefings: the latest version of each series sent to their lists, newest first. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'stakeholder')
  const [briefings, subscriptions] = await Promise.all([portalBriefings(user.id), portalSubscriptions(user.id)])
  return { briefings, subscriptions }
})
