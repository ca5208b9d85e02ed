/**
 * Calibration requests and their contract review (ISO/IEC 17025 7.1): the customer's requirements,
 * the laboratory's review (the terms it offers and its capability check), the agreement — by the
 * customer in the portal or recorded by the laboratory — and only then runs.
 */
import { z } from 'zod'
import { DECISION_RULES, PLACES_OF_CALIBRATION } from '../calibration/constants'
import { pageQuerySchema, versionSchema } from './common'
import { accuracySpecSchema } from './instrument'
import { dateOnlySchema, numberField, optionalText } from './registerQuery'

/**
 * open → reviewed (the lab offers terms) → agreed (customer accepted them, or the lab recorded how
 * they were agreed) → accepted (runs opened); declined at any point before runs. New terms after
 * agreement take the request back to reviewed.
 */
export const REQUEST_STATUSES = ['open', 'reviewed', 'agreed', 'accepted', 'declined'] as const
export type RequestStatus = (typeof REQUEST_STATUSES)[number]
export const REQUEST_STATUS_LABELS: Record<RequestStatus, string> = {
  open: 'Awaiting review',
  reviewed: 'Terms offered — awaiting agreement',
  agreed: 'Terms agreed',
  accepted: 'In work',
  declined: 'Declined',
}

export const AGREEMENT_METHODS = ['portal', 'recorded'] as const
export type AgreementMethod = (typeof AGREEMENT_METHODS)[number]

/** POST /api/requests (customer): which instruments, what is wanted, against which specification. */
export const requestCreateSchema = z.object({
  instrumentIds: z
    .array(z.number({ error: 'Instrument ids are numbers' }).int().positive(), { error: 'Choose the instruments' })
    .min(1, 'Choose at least one instrument')
    .max(50, 'At most 50 instruments per request')
    .refine(ids => new Set(ids).size === ids.length, 'An instrument is listed twice'),
  preferredDate: dateOnlySchema.nullable().optional().default(null),
  /** What the customer wants: points or range, conditions, anything the lab must know. */
  requirements: optionalText(4000).default(null),
  /** The specification to judge conformity against, when the customer names one. */
  specification: accuracySpecSchema.nullable().optional().default(null),
  notes: optionalText(2000).default(null),
})
export type RequestCreateInput = z.infer<typeof requestCreateSchema>

const kelvinPoint = numberField('Calibration point').positive('A calibration point is above 0 K').max(5000, 'At most 5000 K')

/** The terms the laboratory offers after reviewing a request. */
export const requestTermsSchema = z.object({
  procedureVersionId: z.number({ error: 'Choose a procedure' }).int().positive('Choose a procedure'),
  /** Calibration points, K. */
  pointsK: z.array(kelvinPoint, { error: 'Give the calibration points' }).min(1, 'Give at least one calibration point').max(30, 'At most 30 points'),
  /** Measuring distance, mm (null: as the procedure sets it). */
  distanceMm: numberField('Measuring distance').positive('The distance is above 0 mm').max(100_000).nullable().default(null),
  emissivitySetting: numberField('Emissivity setting').gt(0, 'The emissivity setting is above 0').max(1, 'The emissivity setting is at most 1'),
  /** The specification conformity is judged against (null: no statement of conformity is made). */
  specification: accuracySpecSchema.nullable().default(null),
  decisionRule: z.enum(DECISION_RULES, { error: 'Choose a decision rule' }),
  guardBandFactor: numberField('Guard band factor').min(0).max(10).nullable().default(null),
  placeOfCalibration: z.enum(PLACES_OF_CALIBRATION, { error: 'In the laboratory or on site' }).default('laboratory'),
  siteAddress: optionalText(600).default(null),
  /** What the laboratory tells the customer about the review. */
  message: optionalText(2000).default(null),
}).superRefine((v, ctx) => {
  if (v.placeOfCalibration === 'on-site' && !v.siteAddress) ctx.addIssue({ code: 'custom', path: ['siteAddress'], message: 'Give the address of the site' })
  if (v.decisionRule === 'guard-band' && v.guardBandFactor === null) ctx.addIssue({ code: 'custom', path: ['guardBandFactor'], message: 'A guarded acceptance needs its guard band factor' })
})
export type RequestTermsInput = z.infer<typeof requestTermsSchema>

/** POST /api/requests/[id]/review (laboratory). */
export const requestReviewSchema = z.object({ version: versionSchema, terms: requestTermsSchema })
export type RequestReviewInput = z.infer<typeof requestReviewSchema>

/** POST /api/requests/[id]/agree (the customer accepts the reviewed terms in the portal). */
export const requestAgreeSchema = z.object({ version: versionSchema, termsVersion: z.number({ error: 'Which terms?' }).int().min(1) })
export type RequestAgreeInput = z.infer<typeof requestAgreeSchema>

/** POST /api/requests/[id]/record-agreement (the laboratory records how the customer agreed). */
export const requestRecordAgreementSchema = z.object({
  version: versionSchema,
  termsVersion: z.number({ error: 'Which terms?' }).int().min(1),
  note: z.string({ error: 'Say how the customer agreed' }).trim().min(5, 'Say how the customer agreed (who, when, by what means)').max(2000),
})
export type RequestRecordAgreementInput = z.infer<typeof requestRecordAgreementSchema>

/** POST /api/requests/[id]/accept: open a draft run per instrument, on the agreed terms. */
export const requestAcceptSchema = z.object({
  version: versionSchema,
  /** The planned calibration date. */
  calibrationDate: dateOnlySchema,
  /** Who will perform the runs (default: whoever accepts the request). */
  technicianId: z.number({ error: 'Choose the technician' }).int().positive('Choose the technician').nullable().optional().default(null),
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
