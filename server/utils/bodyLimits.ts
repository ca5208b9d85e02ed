/**
 * What a request body may be, per route: its largest size and its content types. Checked before
 * any handler runs (server/middleware/00.guard.ts declares, 02.body.ts reads): a declared
 * Content-Length over the limit is refused at once, and a body without one (chunked) is counted
 * while it streams in and refused the moment it passes the limit — it is never held in full.
 *
 * - JSON everywhere: BODY_MAX_BYTES (default 1 MiB); CSV imports (JSON with the file's text) 8 MiB.
 * - Multipart (a file): only the routes that take files — uploads and a supplier's DCC for an
 *   equipment calibration (UPLOAD_MAX_BYTES + form overhead), and the public verification of a PDF.
 * - Open routes get the tightest limits: sign-in 8 KiB, verification of a PDF 4 MiB, the payment
 *   provider's events 256 KiB.
 */
import { createError, type H3Event } from 'h3'
import { config } from './config'

export type BodyKind = 'json' | 'multipart' | 'pdf'

export interface BodyRule {
  /** Largest body, bytes. */
  maxBytes: number
  /** Content types accepted besides JSON. */
  kinds: readonly BodyKind[]
}

const FORM_OVERHEAD = 64 * 1024
const IMPORT_MAX_BYTES = 8 * 1024 * 1024

/** The rule for a route path (no query string). */
export function bodyRuleFor(path: string): BodyRule {
  const c = config()
  if (path === '/api/auth/login') return { maxBytes: 8 * 1024, kinds: ['json'] }
  if (path === '/api/verify/file') return { maxBytes: 4 * 1024 * 1024, kinds: ['json', 'multipart', 'pdf'] }
  if (path === '/api/payments/webhook') return { maxBytes: 256 * 1024, kinds: ['json'] }
  if (path === '/api/uploads') return { maxBytes: c.uploadMaxBytes + FORM_OVERHEAD, kinds: ['multipart'] }
  if (/^\/api\/(sources|reference-instruments)\/[^/]+\/calibrations\/dcc$/.test(path)) return { maxBytes: c.uploadMaxBytes + FORM_OVERHEAD, kinds: ['multipart'] }
  if (/\/import$/.test(path)) return { maxBytes: Math.max(IMPORT_MAX_BYTES, c.bodyMaxBytes), kinds: ['json'] }
  return { maxBytes: c.bodyMaxBytes, kinds: ['json'] }
}

/** The kind of a Content-Type header value, or null for anything not accepted anywhere. */
export function bodyKindOf(contentType: string | undefined): BodyKind | null {
  const type = (contentType ?? '').split(';')[0]!.trim().toLowerCase()
  if (type === 'application/json') return 'json'
  if (type === 'multipart/form-data') return 'multipart'
  if (type === 'application/pdf' || type === 'application/octet-stream') return 'pdf'
  return null
}

/** "1 MiB", "8 KiB" for a byte count. */
export function sizeInWords(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${+(bytes / (1024 * 1024)).toFixed(1)} MiB`
  return `${Math.ceil(bytes / 1024)} KiB`
}

/** After a 413, at most this much more of the body is read and thrown away, for at most this long. */
const DRAIN_MAX_BYTES = 16 * 1024 * 1024
const DRAIN_MAX_MS = 5_000

/**
 * 413. Once the answer is out, the rest of the body is read and thrown away (never kept) so the
 * client can read the answer, but only up to DRAIN_MAX_BYTES or DRAIN_MAX_MS: past that the
 * connection is closed.
 */
export function refuseTooLarge(event: H3Event, maxBytes: number): never {
  const message = `The request body is larger than this route accepts (${sizeInWords(maxBytes)})`
  const req = event.node.req
  event.node.res.once('finish', () => {
    if (req.complete) return
    let discarded = 0
    const started = Date.now()
    const cut = () => {
      clearTimeout(timer)
      req.off('data', onData)
      req.destroy()
    }
    const onData = (chunk: Buffer) => {
      discarded += chunk.length
      if (discarded > DRAIN_MAX_BYTES || Date.now() - started > DRAIN_MAX_MS) cut()
    }
    const timer = setTimeout(cut, DRAIN_MAX_MS)
    timer.unref()
    req.once('end', () => clearTimeout(timer))
    req.on('data', onData)
    req.resume()
  })
  throw createError({ statusCode: 413, statusMessage: 'Payload Too Large', message, data: { fields: { body: message, file: message } } })
}
