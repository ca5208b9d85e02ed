import { z } from 'zod'

/** A positive integer id in a route parameter (`/api/x/12`). */
export const idParamSchema = z.object({
  id: z.coerce.number({ error: 'Must be a number' }).int('Must be a whole number').positive('Must be positive'),
})

/** Trimmed non-empty text with a maximum length. */
export const text = (max: number, label = 'This field') =>
  z.string({ error: `${label} is required` }).trim().min(1, `${label} is required`).max(max, `At most ${max} characters`)

export const emailSchema = z
  .string({ error: 'E-mail is required' })
  .trim()
  .toLowerCase()
  .max(254, 'At most 254 characters')
  .pipe(z.email({ error: 'Not a valid e-mail address' }))

/** Common list query: paging and sorting, all optional. */
export const pageQuerySchema = z.object({
  page: z.coerce.number().int().min(1, 'Page starts at 1').default(1),
  pageSize: z.coerce.number().int().min(1).max(500, 'At most 500 rows per page').default(50),
  q: z.string().trim().max(200).optional(),
})

/** The version a client last saw, for optimistic locking (409 when stale). */
export const versionSchema = z.number({ error: 'version is required' }).int().min(0)
