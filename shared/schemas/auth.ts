import { z } from 'zod'
import { emailSchema } from './common'

export const loginSchema = z.object({
  email: emailSchema,
  password: z.string({ error: 'Password is required' }).min(1, 'Password is required').max(200),
})
export type LoginInput = z.infer<typeof loginSchema>
