/** Inputs of the nonconformity routes (server/api/nonconformities). */
import { z } from 'zod'
import { CERTIFICATE_DECISIONS, NONCONFORMITY_STATUSES, RISK_LEVELS } from '../quality/constants'
import { pageQuerySchema, text, versionSchema } from './common'
import { dateOnlySchema } from './registerQuery'
import { correctionRowsSchema, equipmentTypeSchema, idField } from './quality'

const risk = z.enum(RISK_LEVELS, { error: `Risk is one of ${RISK_LEVELS.join(', ')}` })

/**
 * POST /api/nonconformities: raised by hand. The affected item and period are optional (an item
 * needs its period); corrections found for the item let the affected points be re-evaluated.
 */
export const nonconformityCreateSchema = z.object({
  title: text(200, 'Title'),
  description: text(8000, 'Description'),
  risk,
  withhold: z.boolean({ error: 'Withhold must be true or false' }).default(false),
  equipmentType: equipmentTypeSchema.nullable().optional().default(null),
  equipmentId: idField('Affected item').nullable().optional().default(null),
  affectedFrom: dateOnlySchema.nullable().optional().default(null),
  affectedTo: dateOnlySchema.nullable().optional().default(null),
  referenceCorrections: correctionRowsSchema.nullable().optional().default(null),
}).superRefine((v, ctx) => {
  if ((v.equipmentType === null) !== (v.equipmentId === null)) {
    ctx.addIssue({ code: 'custom', path: [v.equipmentType === null ? 'equipmentType' : 'equipmentId'], message: 'Name the affected item by its kind and id, or neither' })
  }
  if (v.equipmentId !== null && (v.affectedFrom === null || v.affectedTo === null)) {
    ctx.addIssue({ code: 'custom', path: [v.affectedFrom === null ? 'affectedFrom' : 'affectedTo'], message: 'Give the period of the affected work: from the last good evidence to when the fault was found' })
  }
  if (v.affectedFrom && v.affectedTo && v.affectedFrom > v.affectedTo) {
    ctx.addIssue({ code: 'custom', path: ['affectedTo'], message: 'The end of the period must not be before its start' })
  }
  if (v.equipmentId === null && v.referenceCorrections !== null) {
    ctx.addIssue({ code: 'custom', path: ['referenceCorrections'], message: 'Corrections belong to an affected item: name the item' })
  }
})
export type NonconformityCreateInput = z.infer<typeof nonconformityCreateSchema>

/** PATCH /api/nonconformities/[id]: description, risk, the withhold switch, corrections found. */
export const nonconformityUpdateSchema = z.object({
  title: text(200, 'Title').optional(),
  description: text(8000, 'Description').optional(),
  risk: risk.optional(),
  withhold: z.boolean({ error: 'Withhold must be true or false' }).optional(),
  referenceCorrections: correctionRowsSchema.nullable().optional(),
  version: versionSchema,
})
export type NonconformityUpdateInput = z.infer<typeof nonconformityUpdateSchema>

/**
 * POST /api/nonconformities/[id]/decisions: the decision for one affected certificate. Amend reopens
 * it (a revision run, like "reopen"); withdraw needs the signatory's password again (like "withdraw").
 */
export const nonconformityDecisionSchema = z.object({
  certificateId: idField('Certificate'),
  decision: z.enum(CERTIFICATE_DECISIONS, { error: `Decision is one of ${CERTIFICATE_DECISIONS.join(', ')}` }),
  reason: text(2000, 'Reason'),
  password: z.string({ error: 'password must be text' }).max(200, 'At most 200 characters').optional(),
}).superRefine((v, ctx) => {
  if (v.decision === 'withdraw' && !v.password) ctx.addIssue({ code: 'custom', path: ['password'], message: 'Enter your password to withdraw the certificate' })
})
export type NonconformityDecisionInput = z.infer<typeof nonconformityDecisionSchema>

/** POST /api/nonconformities/[id]/notify: tell the affected customers (all by default), through the outbox. */
export const nonconformityNotifySchema = z.object({
  organizationIds: z.array(idField('Customer'), { error: 'organizationIds is a list of customer ids' }).min(1, 'Choose at least one customer').max(200).optional(),
  message: text(4000, 'Message'),
})
export type NonconformityNotifyInput = z.infer<typeof nonconformityNotifySchema>

/** POST /api/nonconformities/[id]/resume: who authorised resuming work, and why it is safe. */
export const nonconformityResumeSchema = z.object({ note: text(2000, 'Why work may resume'), version: versionSchema })
export type NonconformityResumeInput = z.infer<typeof nonconformityResumeSchema>

/** POST /api/nonconformities/[id]/close */
export const nonconformityCloseSchema = z.object({ note: text(2000, 'Closing note'), version: versionSchema })
export type NonconformityCloseInput = z.infer<typeof nonconformityCloseSchema>

/** GET /api/nonconformities */
export const nonconformityQuerySchema = pageQuerySchema.extend({
  status: z.enum(NONCONFORMITY_STATUSES, { error: 'status is open or closed' }).optional(),
  from: dateOnlySchema.optional(),
  to: dateOnlySchema.optional(),
})
export type NonconformityQuery = z.infer<typeof nonconformityQuerySchema>
