// Replies of the staff side's routes that the pages read (the contract both sides type against).
import type { ListReply } from '../schemas/list'
import type { StaffRole } from '../utils/roles'

/** A staff account on the admin's staff page. Invited until the first sign-in. */
export interface StaffMember {
  id: number
  name: string
  email: string
  role: StaffRole
  status: 'invited' | 'active' | 'disabled'
  createdAt: string
  lastSignInAt: string | null
}
export type StaffListReply = ListReply<StaffMember>

/** One order waiting on the staff, as the desk lists it. */
export interface DeskOrder {
  id: number
  number: string
  schoolName: string
  totalCents: number
  /** When it started waiting (ISO). */
  since: string
}

/**
 * GET /api/staff/desk: what is waiting on the staff. The order lists and their counts are the
 * admin's work (null for support, who see no prices); failed mail is for everyone on the staff.
 */
export interface StaffDesk {
  poToReview: DeskOrder[] | null
  toAllocate: DeskOrder[] | null
  toShip: DeskOrder[] | null
  /** How many orders wait in each list in all (a list shows the oldest 20 of them). */
  waiting: { poToReview: number, toAllocate: number, toShip: number } | null
  failedMail: number
}

/** One message the local fake SMTP server caught, its single-use links masked. */
export interface CaughtMail {
  text: string
  html: string | null
  [field: string]: unknown
}
/** GET /api/staff/mail (admins, fake mode only). */
export interface CaughtMailReply {
  data: CaughtMail[]
}
