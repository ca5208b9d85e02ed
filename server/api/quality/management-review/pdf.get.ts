import { managementReviewQuerySchema } from '#shared/schemas/managementReview'
import { managementReviewDocument } from '#server/services/quality/overview'
import { attachmentDisposition } from '#server/services/uploads/uploads'
import { requirePermission } from '#server/utils/access'
import { parseWith } from '#server/utils/validation'

/** The management-review summary over a period, as a PDF. */
export default defineEventHandler(async (event) => {
  await requirePermission(event, 'quality:overview')
  const q = await getValidatedQuery(event, parseWith(managementReviewQuerySchema))
  const pdf = await managementReviewDocument(q)
  setResponseHeaders(event, {
    'content-type': 'application/pdf',
    'content-length': pdf.length,
    'content-disposition': attachmentDisposition(`management-review-${q.from}-to-${q.to}.pdf`),
    'x-content-type-options': 'nosniff',
    'cache-control': 'private, no-store',
  })
  return pdf
})
