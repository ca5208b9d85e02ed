/**
 * API routes that answer without a session. Everything else under /api answers 401
 * to an anonymous caller (server/middleware/01.session.ts). Keep this list short.
 */
export const OPEN_API_ROUTES: readonly string[] = ['/api/auth/login', '/api/health', '/api/verify', '/api/verify/file', '/api/mail/unsubscribe']

export function isOpenApiRoute(path: string): boolean {
  const p = path.split('?')[0]!.replace(/\/+$/, '')
  return OPEN_API_ROUTES.includes(p)
}
