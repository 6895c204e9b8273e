import type { SessionUser } from '../utils/roles'

declare module '#auth-utils' {
  interface User extends SessionUser {}
  interface UserSession {
    loggedInAt: number
  }
  /** Kept in the sealed cookie only; never sent to the page. */
  interface SecureSessionData {
    sid: string
  }
}

export {}
