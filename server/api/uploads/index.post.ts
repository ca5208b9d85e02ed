import { createUpload } from '#server/services/uploads/uploads'
import { requirePermission } from '#server/utils/access'
import { readFileForm } from '#server/utils/multipart'

/**
 * Upload a file (multipart form: `file`, `purpose`, and `organizationId` for instrument photos).
 * The type is detected from the content; equipment certificates may be uploaded by those who
 * manage equipment, responsivity tables and instrument photos by every laboratory role.
 */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'upload:create')
  const upload = await createUpload(user, await readFileForm(event))
  setResponseStatus(event, 201)
  return upload
})
