import { signInSchema } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const { email, password } = await readValidatedBody(event, signInSchema.parse)
  return signIn(event, email, password)
})
