/** Stakeholder accounts a contact can be linked to (the portal shows them the contact's briefings). */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead')
  return { accounts: await stakeholderAccounts() }
})
