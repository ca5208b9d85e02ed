/** GET /api/quality/management-review(?/pdf)?from=YYYY-MM-DD&to=YYYY-MM-DD (ISO/IEC 17025:2017 8.9). */
import type { z } from 'zod'
import { periodSchema } from './quality'

export const managementReviewQuerySchema = periodSchema
export type ManagementReviewQuery = z.infer<typeof managementReviewQuerySchema>
