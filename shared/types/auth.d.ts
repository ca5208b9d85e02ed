// The shape nuxt-auth-utils keeps in the sealed session cookie.
import type { SessionUser } from './index'

declare module '#auth-utils' {
  // eslint-disable-next-line @typescript-eslint/no-empty-object-type
  interface User extends SessionUser {}
  interface UserSession {
    loggedInAt: string
  }
  /** Server-only part of the session (never sent to the browser's scripts). */
  interface SecureSessionData {
    /** Id of the `UserSession` record (server/utils/sessions.ts). */
    sessionId: string
  }
}

export {}
