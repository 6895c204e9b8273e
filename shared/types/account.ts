import type { SessionUser } from '../utils/roles'
import type { TaxExemptionState } from '../utils/states'

export interface SchoolView {
  id: number
  name: string
  district: string | null
  addressLine1: string
  addressLine2: string | null
  city: string
  region: string
  postalCode: string
  country: string
  taxExemption: TaxExemptionState
}

export interface AccountReply {
  user: SessionUser
  school: SchoolView | null
}

/** A signed-in browser as the account page lists it. */
export interface SessionView {
  id: number
  device: string
  signedInAt: string
  lastSeenAt: string
  current: boolean
}
export interface SessionsReply {
  data: SessionView[]
}

/** POST /api/auth/login, PATCH /api/account: the signed-in person. */
export interface UserReply {
  user: SessionUser
}
/** POST /api/auth/verify-email. */
export interface VerifiedReply {
  verified: true
}
/** POST /api/auth/resend-verification: whether a new link went out. */
export interface ResendVerificationReply {
  sent: boolean
  verified: boolean
}
