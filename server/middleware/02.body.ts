import type { IncomingMessage } from 'node:http'
import { bodyRuleFor, refuseTooLarge } from '#server/utils/bodyLimits'

const PAYLOAD_METHODS = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])
const RAW_BODY = Symbol.for('h3RawBody')

class BodyTooLarge extends Error {}

/** Read a request body, counting; rejects with BodyTooLarge as soon as it passes `max` bytes. */
function readLimited(req: IncomingMessage, max: number): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = []
    let size = 0
    const onData = (chunk: Buffer) => {
      size += chunk.length
      if (size > max) {
        cleanup()
        req.pause()
        reject(new BodyTooLarge())
        return
      }
      chunks.push(chunk)
    }
    const onEnd = () => {
      cleanup()
      resolve(Buffer.concat(chunks, size))
    }
    const onError = (err: Error) => {
      cleanup()
      reject(err)
    }
    const cleanup = () => {
      req.off('data', onData)
      req.off('end', onEnd)
      req.off('error', onError)
    }
    req.on('data', onData)
    req.on('end', onEnd)
    req.on('error', onError)
  })
}

/**
 * Read the body of every /api change within the route's limit (server/utils/bodyLimits.ts), after
 * the session check so an anonymous caller cannot make the server read a large body for a closed
 * route. The bytes are handed to h3, so handlers read them with readBody / readMultipartFormData as
 * usual. A body past the limit answers 413 and the connection is closed without reading the rest.
 */
export default defineEventHandler(async (event) => {
  if (!PAYLOAD_METHODS.has(event.method)) return
  const path = event.path.split('?')[0]!
  if (!path.startsWith('/api/')) return
  const req = event.node.req as IncomingMessage & { [RAW_BODY]?: Promise<Buffer> }
  const length = Number(req.headers['content-length'] ?? '')
  const chunked = /\bchunked\b/i.test(String(req.headers['transfer-encoding'] ?? ''))
  if (!chunked && !(Number.isFinite(length) && length > 0)) return
  const rule = bodyRuleFor(path)
  try {
    const body = await readLimited(req, rule.maxBytes)
    req[RAW_BODY] = Promise.resolve(body)
  }
  catch (err) {
    if (err instanceof BodyTooLarge) refuseTooLarge(event, rule.maxBytes)
    throw createError({ statusCode: 400, statusMessage: 'Bad Request', message: 'The request body could not be read' })
  }
})
