import type { SessionUser } from '../utils/roles'

declare module '#auth-utils' {
  interface User extends SessionUser {}
  interface UserSession {
    loggedInAt: number
  }
}

export {}
