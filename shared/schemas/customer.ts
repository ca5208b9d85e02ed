import { z } from 'zod'
import { emailSchema, text, versionSchema } from './common'
import { optionalText } from './registerQuery'

/** The address printed on certificates. */
const addressFields = {
  /** Street lines, one per line. */
  addressLines: z.string({ error: 'Address is required' }).trim().min(1, 'Address is required').max(500, 'At most 500 characters'),
  city: text(120, 'City'),
  postcode: optionalText(20),
  country: text(80, 'Country'),
}

/** POST /api/customers (also the organization part of a CSV row). */
export const customerCreateSchema = z.object({
  name: text(160, 'Name'),
  contactEmails: z.array(emailSchema).max(20, 'At most 20 addresses').default([]),
  ...addressFields,
  postcode: addressFields.postcode.default(null),
})
export type CustomerCreateInput = z.infer<typeof customerCreateSchema>

/** PATCH /api/customers/[id] */
export const customerUpdateSchema = z.object({
  name: text(160, 'Name').optional(),
  contactEmails: z.array(emailSchema).max(20, 'At most 20 addresses').optional(),
  addressLines: addressFields.addressLines.optional(),
  city: addressFields.city.optional(),
  postcode: addressFields.postcode,
  country: addressFields.country.optional(),
  active: z.boolean({ error: 'active must be true or false' }).optional(),
  version: versionSchema,
})
export type CustomerUpdateInput = z.infer<typeof customerUpdateSchema>

const phoneSchema = z
  .string()
  .trim()
  .max(40, 'At most 40 characters')
  .regex(/^$|^\+?[0-9 ()./-]{3,40}$/, 'Digits, spaces and + ( ) - . / only')
  .nullable()
  .optional()
  .transform(v => (v === '' ? null : v))

/** POST /api/customers/[id]/contacts */
export const contactCreateSchema = z.object({
  name: text(120, 'Name'),
  email: emailSchema,
  phone: phoneSchema.default(null),
  receivesReminders: z.boolean({ error: 'receivesReminders must be true or false' }).default(true),
})
export type ContactCreateInput = z.infer<typeof contactCreateSchema>

/** PATCH /api/contacts/[id] (deactivate with `active: false`; contacts are never deleted). */
export const contactUpdateSchema = z.object({
  name: text(120, 'Name').optional(),
  email: emailSchema.optional(),
  phone: phoneSchema,
  receivesReminders: z.boolean({ error: 'receivesReminders must be true or false' }).optional(),
  active: z.boolean({ error: 'active must be true or false' }).optional(),
  version: versionSchema,
})
export type ContactUpdateInput = z.infer<typeof contactUpdateSchema>
