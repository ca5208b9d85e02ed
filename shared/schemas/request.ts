import { z } from 'zod'
import { pageQuerySchema, versionSchema } from './common'
import { dateOnlySchema, optionalText } from './registerQuery'

export const REQUEST_STATUSES = ['open', 'accepted', 'declined'] as const
export type RequestStatus = (typeof REQUEST_STATUSES)[number]
export const REQUEST_STATUS_LABELS: Record<RequestStatus, string> = { open: 'Open', accepted: 'Accepted', declined: 'Declined' }

/** POST /api/requests (customer): which of its instruments, when it would like them done, notes. */
export const requestCreateSchema = z.object({
  instrumentIds: z
    .array(z.number({ error: 'Instrument ids are numbers' }).int().positive(), { error: 'Choose the instruments' })
    .min(1, 'Choose at least one instrument')
    .max(50, 'At most 50 instruments per request')
    .refine(ids => new Set(ids).size === ids.length, 'An instrument is listed twice'),
  preferredDate: dateOnlySchema.nullable().optional().default(null),
  notes: optionalText(2000).default(null),
})
export type RequestCreateInput = z.infer<typeof requestCreateSchema>

/** POST /api/requests/[id]/accept: the procedure for the runs and the date the items arrived. */
export const requestAcceptSchema = z.object({
  version: versionSchema,
  procedureVersionId: z.number({ error: 'Choose a procedure' }).int().positive('Choose a procedure'),
  receivedDate: dateOnlySchema,
  response: optionalText(2000).default(null),
})
export type RequestAcceptInput = z.infer<typeof requestAcceptSchema>

/** POST /api/requests/[id]/decline */
export const requestDeclineSchema = z.object({
  version: versionSchema,
  response: z.string({ error: 'Say why' }).trim().min(1, 'Say why the request is declined').max(2000),
})
export type RequestDeclineInput = z.infer<typeof requestDeclineSchema>

export const requestQuerySchema = pageQuerySchema.extend({
  status: z.enum(REQUEST_STATUSES, { error: `status is one of ${REQUEST_STATUSES.join(', ')}` }).optional(),
})
