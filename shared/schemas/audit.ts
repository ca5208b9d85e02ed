import { z } from 'zod'
import { pageQuerySchema } from './common'

export const auditQuerySchema = pageQuerySchema.extend({
  entity: z.string().trim().max(60).optional(),
  entityId: z.coerce.number().int().positive().optional(),
  userId: z.coerce.number().int().positive().optional(),
  action: z.string().trim().max(60).optional(),
  from: z.iso.datetime({ offset: true, error: 'Use an ISO 8601 date-time' }).optional(),
  to: z.iso.datetime({ offset: true, error: 'Use an ISO 8601 date-time' }).optional(),
})
export type AuditQuery = z.infer<typeof auditQuerySchema>
