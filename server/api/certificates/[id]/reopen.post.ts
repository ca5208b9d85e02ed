import { idParamSchema } from '#shared/schemas/common'
import { certificateReopenSchema } from '#shared/schemas/certificate'
import { reopenCertificate } from '#server/services/certificates/issue'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/**
 * Reopen an issued certificate for correction: a new revision of its run (a copy, with the
 * reason) that goes through entry, review and signing again; the certificate stays valid until
 * the amendment supersedes it. Answers the new run.
 */
export default defineEventHandler(async (event) => {
  const user = await requirePermission(event, 'certificate:reopen')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const input = await readValidatedBody(event, parseWith(certificateReopenSchema))
  const run = await reopenCertificate(user, id, input)
  setResponseStatus(event, 201)
  return run
})
