import { demoTruthsSchema } from '#shared/schemas/methodChecks'

/** Adds the invented demo truth fields that are missing (idempotent); answers the list. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin', 'duty_lead', 'forecaster')
  await readValidatedBody(event, demoTruthsSchema.parse)
  const added = await ensureDemoTruths()
  if (added > 0) await recordAudit({ actor: user, action: 'method_check.demo_truths', entityType: 'method_check_truth', after: { added } }, event)
  return { added, truths: await listMethodCheckTruths() }
})
