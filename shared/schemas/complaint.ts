/** Inputs of the complaint routes (server/api/complaints). */
import { z } from 'zod'
import { COMPLAINT_STATUSES } from '../quality/constants'
import { pageQuerySchema, text, versionSchema } from './common'
import { dateOnlySchema } from './registerQuery'
import { idField } from './quality'

/**
 * POST /api/complaints. A customer submits in the portal, about its own organization's certificate
 * or instrument (or the service in general); the laboratory records one it received otherwise and
 * names the customer (`organizationId`) and when it came in (`receivedOn`, default today).
 */
export const complaintCreateSchema = z.object({
  subject: text(200, 'Subject'),
  description: text(8000, 'What happened'),
  certificateId: idField('Certificate').nullable().optional().default(null),
  instrumentId: idField('Instrument').nullable().optional().default(null),
  organizationId: idField('Customer').nullable().optional().default(null),
  receivedOn: dateOnlySchema.nullable().optional().default(null),
})
export type ComplaintCreateInput = z.infer<typeof complaintCreateSchema>

/** PATCH /api/complaints/[id]: the investigation (moves a received complaint to "under investigation"). */
export const complaintInvestigationSchema = z.object({
  investigation: text(8000, 'Investigation'),
  nonconformityId: idField('Nonconformity').nullable().optional(),
  version: versionSchema,
})
export type ComplaintInvestigationInput = z.infer<typeof complaintInvestigationSchema>

/** POST /api/complaints/[id]/outcome: the outcome to be approved and told to the complainant. */
export const complaintOutcomeSchema = z.object({ outcome: text(4000, 'Outcome'), version: versionSchema })
export type ComplaintOutcomeInput = z.infer<typeof complaintOutcomeSchema>

/** POST /api/complaints/[id]/approve: approve the outcome (someone not involved) and close; the closing notice is mailed. */
export const complaintApproveSchema = z.object({ version: versionSchema })
export type ComplaintApproveInput = z.infer<typeof complaintApproveSchema>

/** GET /api/complaints */
export const complaintQuerySchema = pageQuerySchema.extend({
  status: z.enum(COMPLAINT_STATUSES, { error: `status is one of ${COMPLAINT_STATUSES.join(', ')}` }).optional(),
  open: z.enum(['true', 'false'], { error: 'open is true or false' }).optional(),
})
export type ComplaintQuery = z.infer<typeof complaintQuerySchema>
