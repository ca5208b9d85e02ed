import { z } from 'zod'
import { isIsoDate, isValidTimeZone } from '../mail/milestones'
import { pageQuerySchema, versionSchema } from './common'

export const OUTBOX_STATUSES = ['queued', 'sent', 'failed'] as const
export type OutboxStatus = (typeof OUTBOX_STATUSES)[number]

/**
 * What a message is about. `reminder` goes to customer contacts, `equipment-alert` and
 * `quality-alert` (overdue corrective actions) to quality managers; complaint acknowledgements and
 * closing notices to the complainant; `nonconformity-notice` to the customers of affected work.
 * Billing: quotes to the requester, an order's receipt and return, invoices and credit notes (with
 * their PDF), payments received, and the weekly `invoice-overdue` reminder to the organization.
 */
export const MAIL_KINDS = ['reminder', 'equipment-alert', 'request-received', 'request-reviewed', 'request-accepted', 'certificate-issued', 'certificate-amended', 'certificate-withdrawn', 'complaint-received', 'complaint-closed', 'nonconformity-notice', 'quality-alert',
  'quote-sent', 'order-received', 'order-returned', 'invoice-issued', 'credit-note-issued', 'invoice-overdue', 'payment-received'] as const
export type MailKind = (typeof MAIL_KINDS)[number]

export const outboxQuerySchema = pageQuerySchema.extend({
  status: z.enum(OUTBOX_STATUSES, { error: 'Use queued, sent or failed' }).optional(),
  kind: z.enum(MAIL_KINDS, { error: 'Not a kind of message' }).optional(),
})
export type OutboxQuery = z.infer<typeof outboxQuerySchema>

export const receivedQuerySchema = z.object({
  page: z.coerce.number().int().min(1, 'Page starts at 1').default(1),
  pageSize: z.coerce.number().int().min(1).max(100, 'At most 100 messages per page').default(25),
})

export const labDateSchema = z.string({ error: 'Use a date YYYY-MM-DD' }).refine(isIsoDate, 'Use a date YYYY-MM-DD')

/** Preview of the next reminder run, optionally as of another lab-local date. Writes nothing. */
export const reminderPreviewQuerySchema = z.object({
  date: labDateSchema.optional(),
})

/** "Run reminders now" takes no options: it always runs for today in the lab's time zone. */
export const reminderRunSchema = z.strictObject({}, { error: 'Send an empty JSON object' })

export const leadTimesSchema = z
  .array(z.number({ error: 'Days must be a number' }).int('Whole days').min(1, 'At least 1 day').max(366, 'At most 366 days'), { error: 'A list of days' })
  .min(1, 'At least one lead time')
  .max(6, 'At most 6 lead times')
  .refine(a => new Set(a).size === a.length, 'Each lead time once')

export const mailSettingsUpdateSchema = z.strictObject({
  version: versionSchema,
  sendHour: z.number({ error: 'An hour 0–23' }).int('An hour 0–23').min(0, 'An hour 0–23').max(23, 'An hour 0–23').optional(),
  timeZone: z.string({ error: 'A time zone such as Europe/London' }).trim().max(64).refine(isValidTimeZone, 'Not a known time zone (e.g. Europe/London)').optional(),
  leadTimes: leadTimesSchema.optional(),
  overdueWeekly: z.boolean({ error: 'true or false' }).optional(),
})
export type MailSettingsUpdateInput = z.infer<typeof mailSettingsUpdateSchema>

export const unsubscribeQuerySchema = z.object({
  token: z.string({ error: 'The link has no token' }).min(10, 'Not a valid token').max(200, 'Not a valid token'),
})
