import { z } from 'zod'
import { emailSchema, text, versionSchema } from './common'

export const organizationCreateSchema = z.object({
  name: text(160, 'Name'),
  contactEmails: z.array(emailSchema).max(20, 'At most 20 addresses').default([]),
})
export type OrganizationCreateInput = z.infer<typeof organizationCreateSchema>

export const organizationUpdateSchema = z.object({
  name: text(160, 'Name').optional(),
  contactEmails: z.array(emailSchema).max(20, 'At most 20 addresses').optional(),
  active: z.boolean().optional(),
  version: versionSchema,
})
export type OrganizationUpdateInput = z.infer<typeof organizationUpdateSchema>
