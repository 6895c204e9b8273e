import type { SessionUser } from '../utils/roles'

declare module '#auth-utils' {
  // Merges SessionUser into the module's own User type.
  // eslint-disable-next-line @typescript-eslint/no-empty-object-type
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
