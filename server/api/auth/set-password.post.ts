import { setPasswordSchema } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const { token, password } = await readValidatedBody(event, setPasswordSchema.parse)
  return setPasswordWithToken(event, token, password)
})
