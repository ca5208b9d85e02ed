import { unsubscribeQuerySchema } from '#shared/schemas/mail'
import { unsubscribePage } from '#server/services/mail/unsubscribe'

/**
 * Open route (the link in every customer reminder): the signed token names a contact, who stops
 * receiving recalibration reminders; the change is audited. A bad or unknown token → 400.
 */
export default defineEventHandler(async (event) => {
  const { token } = await getValidatedQuery(event, (q) => {
    const r = unsubscribeQuerySchema.safeParse(q)
    if (r.success) return r.data
    throw { message: 'Invalid input: token: Not a valid unsubscribe link', fields: { token: 'Not a valid unsubscribe link' } }
  })
  const html = await unsubscribePage(token)
  setResponseHeader(event, 'content-type', 'text/html; charset=utf-8')
  setResponseHeader(event, 'cache-control', 'no-store')
  // A page of its own: inline styles only, nothing else.
  setResponseHeader(event, 'content-security-policy', "default-src 'none'; style-src 'unsafe-inline'; frame-ancestors 'none'")
  return html
})
