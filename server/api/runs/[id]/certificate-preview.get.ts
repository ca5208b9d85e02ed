import { idParamSchema } from '#shared/schemas/common'
import { certificatePreview } from '#server/services/certificates/issue'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'
import { attachmentDisposition } from '#server/services/uploads/uploads'

/**
 * The certificate this run would give, drawn from the record as it stands: watermarked
 * "draft — not valid", no number, signature or code. For the technician and the reviewer before
 * signing; 409 naming what is missing while the record cannot support a certificate yet.
 */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'run:read')
  const { id } = await getValidatedRouterParams(event, parseWith(idParamSchema))
  const pdf = await certificatePreview(id)
  setResponseHeaders(event, {
    'content-type': 'application/pdf',
    'content-length': pdf.length,
    'content-disposition': attachmentDisposition(`run-${id}-certificate-draft.pdf`),
    'x-content-type-options': 'nosniff',
    'cache-control': 'private, no-store',
  })
  return pdf
})
