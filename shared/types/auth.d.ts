// The shape nuxt-auth-utils keeps in the sealed session cookie.
import type { SessionUser } from './index'

declare module '#auth-utils' {
  // eslint-disable-next-line @typescript-eslint/no-empty-object-type
  interface User extends SessionUser {}
  interface UserSession {
    loggedInAt: string
  }
}

export {}
