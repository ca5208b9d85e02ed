/** Inputs of the interval-review routes (…/[id]/interval-review, …/[id]/interval-decisions). */
import { z } from 'zod'
import { INTERVAL_METHODS } from '../quality/constants'
import { text } from './common'

const months = (label: string) => z.coerce.number({ error: `${label} must be a number of months` }).int(`${label}: whole months`).min(1, `${label}: at least 1 month`).max(240, `${label}: at most 240 months`)
const factor = (label: string) => z.coerce.number({ error: `${label} must be a number` }).finite(`${label} must be a number`)

/**
 * GET …/interval-review: the analysis settings the laboratory chooses. Staircase: lengthen by
 * `lengthenFactor` (> 1) when found in tolerance within `lengthenWithinFraction` of it, shorten by
 * `shortenFactor` (0–1) when not, held within `minMonths`–`maxMonths`. Drift: k (`coverageFactor`),
 * the longest interval `maxMonths`, the fit (`weighting`); the history is read at `temperatureK`
 * (default the temperature with the most as-found results).
 */
export const intervalReviewQuerySchema = z.object({
  temperatureK: z.coerce.number({ error: 'temperatureK must be a number' }).finite('temperatureK must be a number').positive('temperatureK must be above 0 K').optional(),
  lengthenFactor: factor('Lengthen factor').gt(1, 'The lengthen factor must be above 1').max(4, 'The lengthen factor is at most 4').default(1.25),
  shortenFactor: factor('Shorten factor').gt(0, 'The shorten factor must be above 0').lt(1, 'The shorten factor must be below 1').default(0.5),
  lengthenWithinFraction: factor('Lengthen within').gt(0, 'Lengthen within must be above 0').max(1, 'Lengthen within is at most 1 (100 % of the tolerance)').default(0.8),
  minMonths: months('Shortest interval').default(3),
  maxMonths: months('Longest interval').default(36),
  coverageFactor: factor('Coverage factor k').gt(0, 'k must be above 0').max(10, 'k is at most 10').default(2),
  weighting: z.enum(['weighted', 'ordinary'], { error: 'weighting is weighted or ordinary' }).default('weighted'),
}).refine(v => v.maxMonths >= v.minMonths, { path: ['maxMonths'], message: 'The longest interval must not be shorter than the shortest' })
export type IntervalReviewQuery = z.infer<typeof intervalReviewQuerySchema>

/** POST …/interval-decisions: the interval decided, with the method and reason (the analysis is recorded with it). */
export const intervalDecisionSchema = z.object({
  method: z.enum(INTERVAL_METHODS, { error: `Method is one of ${INTERVAL_METHODS.join(', ')}` }),
  decidedMonths: z.number({ error: 'The interval decided must be a number of months' }).int('The interval decided: whole months').min(1, 'At least 1 month').max(240, 'At most 240 months'),
  reason: text(4000, 'Reason'),
  /** The settings of the analysis shown (as in the review query). */
  settings: z.record(z.string(), z.union([z.number(), z.string()]), { error: 'settings is an object of the analysis settings' }).optional(),
})
export type IntervalDecisionInput = z.infer<typeof intervalDecisionSchema>
