import { z } from 'zod'

export const jobIdParamSchema = z.object({ id: z.uuid({ error: 'Not a job id' }) })
