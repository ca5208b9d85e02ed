import { z } from 'zod'
import { ROLES } from '../roles'
import { emailSchema, text, versionSchema } from './common'

export const roleSchema = z.enum(ROLES, { error: `Role must be one of ${ROLES.join(', ')}` })

/** Passwords: at least 12 characters (NIST SP 800-63B allows long passphrases; no composition rules). */
export const passwordSchema = z
  .string({ error: 'Password is required' })
  .min(12, 'At least 12 characters')
  .max(200, 'At most 200 characters')

const organizationRef = z.number().int().positive().nullable().optional()

function customerNeedsOrganization(v: { role?: string, organizationId?: number | null }, ctx: z.RefinementCtx) {
  if (v.role === 'customer' && !v.organizationId) {
    ctx.addIssue({ code: 'custom', path: ['organizationId'], message: 'A customer user belongs to an organization' })
  }
  if (v.role && v.role !== 'customer' && v.organizationId) {
    ctx.addIssue({ code: 'custom', path: ['organizationId'], message: 'Only customer users belong to an organization' })
  }
}

export const userCreateSchema = z
  .object({
    email: emailSchema,
    name: text(120, 'Name'),
    role: roleSchema,
    organizationId: organizationRef,
    password: passwordSchema,
  })
  .superRefine(customerNeedsOrganization)
export type UserCreateInput = z.infer<typeof userCreateSchema>

export const userUpdateSchema = z
  .object({
    name: text(120, 'Name').optional(),
    role: roleSchema.optional(),
    organizationId: organizationRef,
    version: versionSchema,
  })
  .superRefine(customerNeedsOrganization)
export type UserUpdateInput = z.infer<typeof userUpdateSchema>

export const passwordResetSchema = z.object({ password: passwordSchema })
export type PasswordResetInput = z.infer<typeof passwordResetSchema>

export const userListQuerySchema = z.object({
  includeInactive: z.enum(['true', 'false']).default('true').transform(v => v === 'true'),
})

export const activeFlagSchema = z.object({ active: z.boolean({ error: 'active must be true or false' }) })
