/**
 * Facts about the request that several parts need, read one way: the client's address, its user
 * agent and the origin this server answers as. Behind a reverse proxy you control, set
 * TRUST_PROXY=1 so the address comes from X-Forwarded-For and the origin from X-Forwarded-Host and
 * X-Forwarded-Proto; otherwise those headers are ignored (a client could set them).
 */
import { getRequestHeader, getRequestIP, type H3Event } from 'h3'
import { config } from './config'

/** The client's address (`unknown` when the socket has none). */
export function clientAddress(event: H3Event): string {
  return getRequestIP(event, { xForwardedFor: config().trustProxy }) ?? 'unknown'
}

/** The client's user agent, shortened for the audit trail. */
export function clientUserAgent(event: H3Event): string {
  return (getRequestHeader(event, 'user-agent') ?? '').slice(0, 300)
}

/** `scheme://host[:port]` as the client addressed this server. */
export function serverOrigin(event: H3Event): string {
  const trust = config().trustProxy
  const host = (trust && getRequestHeader(event, 'x-forwarded-host')?.split(',')[0]?.trim()) || getRequestHeader(event, 'host') || ''
  const forwardedProto = trust ? getRequestHeader(event, 'x-forwarded-proto')?.split(',')[0]?.trim() : undefined
  const encrypted = (event.node.req.socket as { encrypted?: boolean }).encrypted === true
  const proto = forwardedProto || (encrypted ? 'https' : 'http')
  return `${proto}://${host}`.toLowerCase()
}
