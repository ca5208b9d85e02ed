/** Inputs of the corrective-action routes (server/api/corrective-actions). */
import { z } from 'zod'
import { CORRECTIVE_ACTION_STATUSES } from '../quality/constants'
import { pageQuerySchema, text, versionSchema } from './common'
import { dateOnlySchema, optionalText } from './registerQuery'
import { idField } from './quality'

export const actionItemSchema = z.object({
  description: text(2000, 'Action'),
  ownerId: idField('Owner'),
  dueDate: dateOnlySchema,
})
export type ActionItemInput = z.infer<typeof actionItemSchema>

/** POST /api/corrective-actions: linked to a nonconformity or a complaint (or both). */
export const correctiveActionCreateSchema = z.object({
  nonconformityId: idField('Nonconformity').nullable().optional().default(null),
  complaintId: idField('Complaint').nullable().optional().default(null),
  title: text(200, 'Title'),
  cause: text(8000, 'Cause'),
  items: z.array(actionItemSchema, { error: 'items is a list of actions' }).max(50, 'At most 50 actions').default([]),
  effectivenessDueOn: dateOnlySchema.nullable().optional().default(null),
}).superRefine((v, ctx) => {
  if (v.nonconformityId === null && v.complaintId === null) {
    ctx.addIssue({ code: 'custom', path: ['nonconformityId'], message: 'Link the corrective action to a nonconformity or a complaint' })
  }
})
export type CorrectiveActionCreateInput = z.infer<typeof correctiveActionCreateSchema>

/** PATCH /api/corrective-actions/[id] */
export const correctiveActionUpdateSchema = z.object({
  title: text(200, 'Title').optional(),
  cause: text(8000, 'Cause').optional(),
  effectivenessDueOn: dateOnlySchema.nullable().optional(),
  version: versionSchema,
})
export type CorrectiveActionUpdateInput = z.infer<typeof correctiveActionUpdateSchema>

/** POST /api/corrective-actions/[id]/items */
export const actionItemCreateSchema = actionItemSchema.extend({ version: versionSchema })
export type ActionItemCreateInput = z.infer<typeof actionItemCreateSchema>

/** POST /api/corrective-actions/[id]/items/[itemId]/done */
export const actionItemDoneSchema = z.object({
  doneOn: dateOnlySchema.nullable().optional().default(null),
  note: optionalText(2000).default(null),
})
export type ActionItemDoneInput = z.infer<typeof actionItemDoneSchema>

/** POST /api/corrective-actions/[id]/effectiveness */
export const effectivenessSchema = z.object({
  effective: z.boolean({ error: 'Effective must be true or false' }),
  check: text(4000, 'What the effectiveness check looked at and found'),
  version: versionSchema,
})
export type EffectivenessInput = z.infer<typeof effectivenessSchema>

/** POST /api/corrective-actions/[id]/close */
export const correctiveActionCloseSchema = z.object({ version: versionSchema })
export type CorrectiveActionCloseInput = z.infer<typeof correctiveActionCloseSchema>

/** GET /api/corrective-actions */
export const correctiveActionQuerySchema = pageQuerySchema.extend({
  status: z.enum(CORRECTIVE_ACTION_STATUSES, { error: 'status is open or closed' }).optional(),
  overdue: z.enum(['true', 'false'], { error: 'overdue is true or false' }).optional(),
})
export type CorrectiveActionQuery = z.infer<typeof correctiveActionQuerySchema>
