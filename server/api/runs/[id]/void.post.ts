import { idParamSchema } from '#shared/schemas/common'
import { voidSchema } from '#shared/schemas/run'
import { assertRunOpen, voidRun } from '#server/services/runs/runs'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** Void a draft or returned run with the reason: it is kept and audited, and never certified. */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'run:edit')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  await assertRunOpen(id)
  const input = await readValidatedBody(event, parseWith(voidSchema))
  return await voidRun(user, id, input)
})
