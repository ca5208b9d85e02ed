/** GET /api/sources/[id]/impact and /api/reference-instruments/[id]/impact?from=YYYY-MM-DD&to=YYYY-MM-DD */
import type { z } from 'zod'
import { periodSchema } from './quality'

export const impactQuerySchema = periodSchema
export type ImpactQuery = z.infer<typeof impactQuerySchema>
