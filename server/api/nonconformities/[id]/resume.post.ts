import { idParamSchema } from '#shared/schemas/common'
import { nonconformityResumeSchema } from '#shared/schemas/nonconformity'
import { resumeWork } from '#server/services/nonconformities/nonconformities'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Record who authorised resuming work and why; an item this record took out of service goes back in service. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'nonconformity:manage')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(nonconformityResumeSchema))
  return await resumeWork(user, id, input)
})
