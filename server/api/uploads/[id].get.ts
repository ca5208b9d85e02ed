import { idParamSchema } from '#shared/schemas/common'
import { downloadableUpload, sendStoredFile } from '#server/services/uploads/uploads'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/**
 * Download an upload as an attachment with its detected type. Laboratory roles get every file;
 * a customer only photos of its own organization's instruments; anything else answers 404.
 */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'upload:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  return sendStoredFile(event, await downloadableUpload(user, id))
})
