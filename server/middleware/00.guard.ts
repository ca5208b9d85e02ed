import type { H3Event } from 'h3'
import { bodyKindOf, bodyRuleFor, refuseTooLarge } from '#server/utils/bodyLimits'
import { config } from '#server/utils/config'
import { serverOrigin } from '#server/utils/request'

const PAYLOAD_METHODS = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])

/**
 * First wall of every request:
 * - security headers on every answer (pages get their CSP with a nonce from server/plugins/csp.ts);
 * - request forgery: a change (POST, PUT, PATCH, DELETE under /api) must come from this site — a
 *   browser's `Origin` must be this server's (or one in ALLOWED_ORIGINS) and `Sec-Fetch-Site`, when
 *   sent, `same-origin` — and must carry JSON (or a file where the route takes one); HTML forms
 *   cannot send either, so a page elsewhere cannot make a signed-in browser change anything;
 * - a declared body larger than the route allows is refused before it is read (413).
 */
export default defineEventHandler((event) => {
  const res = event.node.res
  res.setHeader('x-content-type-options', 'nosniff')
  res.setHeader('referrer-policy', 'same-origin')
  res.setHeader('x-frame-options', 'DENY')
  res.setHeader('cross-origin-opener-policy', 'same-origin')
  res.setHeader('permissions-policy', 'camera=(), microphone=(), geolocation=(), payment=()')
  const path = event.path.split('?')[0]!
  const api = path.startsWith('/api/')
  if (api) res.setHeader('content-security-policy', "default-src 'none'; frame-ancestors 'none'")
  if (!api || !PAYLOAD_METHODS.has(event.method)) return

  const origin = getRequestHeader(event, 'origin')
  const site = getRequestHeader(event, 'sec-fetch-site')
  const allowed = origin !== undefined && allowedOrigins(event).includes(origin.toLowerCase().replace(/\/+$/, ''))
  if (origin !== undefined && !allowed) forbidden(`Changes are accepted only from this site's own pages (not from ${origin})`)
  if (site !== undefined && site !== 'same-origin' && site !== 'none' && !allowed) forbidden('Changes are accepted only from this site\'s own pages')

  const rule = bodyRuleFor(path)
  const length = Number(getRequestHeader(event, 'content-length') ?? '')
  const chunked = /\bchunked\b/i.test(getRequestHeader(event, 'transfer-encoding') ?? '')
  const hasBody = chunked || (Number.isFinite(length) && length > 0)
  if (!hasBody) return
  // The types an HTML form can send (form-encoded, multipart where no file is taken, plain text)
  // are refused outright. A route that takes another accepted type than the one sent (JSON to a file
  // upload) answers for itself, after its access check.
  const kind = bodyKindOf(getRequestHeader(event, 'content-type'))
  if (!kind || (kind === 'multipart' && !rule.kinds.includes('multipart'))) {
    const expected = rule.kinds.map(k => ({ json: 'application/json', multipart: 'multipart/form-data', pdf: 'application/pdf' })[k]).join(' or ')
    throw createError({ statusCode: 415, statusMessage: 'Unsupported Media Type', message: `Send the body as ${expected}`, data: { fields: { body: `Send the body as ${expected}` } } })
  }
  if (Number.isFinite(length) && length > rule.maxBytes) refuseTooLarge(event, rule.maxBytes)
})

function allowedOrigins(event: H3Event): string[] {
  const c = config()
  return [serverOrigin(event), new URL(c.publicBaseUrl).origin.toLowerCase(), ...c.allowedOrigins.map(o => o.toLowerCase())]
}

function forbidden(message: string): never {
  throw createError({ statusCode: 403, statusMessage: 'Forbidden', message })
}
