/**
 * Signed unsubscribe tokens. A token names one contact: `<contactId>.<signature>`, where the
 * signature is HMAC-SHA256 over `bandlight-unsubscribe:<contactId>` with the key from
 * `MAIL_TOKEN_SECRET` (or, when unset, `NUXT_SESSION_PASSWORD`), base64url-encoded. It does not
 * expire: a link in a year-old reminder still works. No Nuxt or Nitro imports.
 */
import crypto from 'node:crypto'
import { config } from '#server/utils/config'
import { publicBaseUrl } from '#server/utils/publicUrl'

function tokenKey(): string {
  const key = config().mail.tokenSecret || config().sessionPassword
  if (!key) throw new Error('Set MAIL_TOKEN_SECRET or NUXT_SESSION_PASSWORD to sign unsubscribe links')
  return key
}

function signature(contactId: number): Buffer {
  return crypto.createHmac('sha256', tokenKey()).update(`bandlight-unsubscribe:${contactId}`).digest()
}

export function unsubscribeToken(contactId: number): string {
  return `${contactId}.${signature(contactId).toString('base64url')}`
}

/** The contact id a token names, or null when it is malformed or its signature is wrong. */
export function verifyUnsubscribeToken(token: string): number | null {
  const m = /^([1-9]\d{0,9})\.([A-Za-z0-9_-]{43})$/.exec(token)
  if (!m) return null
  const id = Number(m[1])
  const given = Buffer.from(m[2]!, 'base64url')
  const expected = signature(id)
  return given.length === expected.length && crypto.timingSafeEqual(given, expected) ? id : null
}

/** The signed unsubscribe link for a contact, on the public address. */
export function unsubscribeUrl(contactId: number): string {
  return `${publicBaseUrl()}/api/mail/unsubscribe?token=${encodeURIComponent(unsubscribeToken(contactId))}`
}
