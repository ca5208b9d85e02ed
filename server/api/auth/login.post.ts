import { loginSchema } from '#shared/schemas/auth'
import { signIn } from '#server/services/auth/signIn'
import { parseWith } from '#server/utils/validation'

/** Sign in with e-mail and password (open route; throttled, failures audited). */
export default defineEventHandler(async (event) => {
  const input = await readValidatedBody(event, parseWith(loginSchema))
  return await signIn(event, input)
})
