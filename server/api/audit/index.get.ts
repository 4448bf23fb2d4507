import { z } from 'zod'

const querySchema = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
})

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin', 'duty_lead')
  const { limit, offset } = await getValidatedQuery(event, querySchema.parse)
  return listAudit(limit, offset)
})
