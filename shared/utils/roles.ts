// Roles and the named authorization rules that both the routes and the pages use.
// The server is the gate; pages call these only to hide what a role cannot use.
export const ROLES = ['teacher', 'builder', 'support', 'admin'] as const
export type Role = (typeof ROLES)[number]
/** The roles of the back office, the only ones the staff accounts page manages. */
export const STAFF_ROLES = ['support', 'admin'] as const satisfies readonly Role[]
export type StaffRole = (typeof STAFF_ROLES)[number]

export interface SessionUser {
  id: number
  /** Null for a builder who joined with a code (no e-mail address is asked of students). */
  email: string | null
  /** A builder's sign-in name; null for e-mail accounts. */
  username: string | null
  name: string
  role: Role
  schoolId: number | null
  verified: boolean
}

type Who = Pick<SessionUser, 'role'> | null | undefined

export const isStaff = (u: Who) => u?.role === 'support' || u?.role === 'admin'
export const isAdmin = (u: Who) => u?.role === 'admin'
export const isCustomer = (u: Who) => u?.role === 'teacher' || u?.role === 'builder'

/** Teachers buy; builders never see prices, payments or invoices. */
export const canBuy = (u: Who) => u?.role === 'teacher'
/** Prices are public, but a student builder's pages never show money. */
export const canSeePrices = (u: Who) => u?.role !== 'builder'

/** Where each role starts after signing in: builders at their rigs (the planner is a click
 *  away), support at the help queue, admins at their desk, teachers at home. */
export function landingFor(u: Who): string {
  if (u?.role === 'builder') return '/rigs'
  if (u?.role === 'support') return '/help-queue'
  if (isStaff(u)) return '/staff'
  return '/'
}
export const canUseHelpQueue = isStaff
export const canManageCatalog = isAdmin
export const canManageStaff = isAdmin
/** The caught-mail viewer exists only while the local fakes are on, and only for admins
 *  (its single-use links are masked even then). */
export const canReadCaughtMail = isAdmin

export const ROLE_LABELS: Record<Role, string> = {
  teacher: 'Teacher',
  builder: 'Builder',
  support: 'Support',
  admin: 'Admin',
}

export interface NavLink {
  to: string
  label: string
}

/** The header's links for a role (anonymous visitors get the public ones). */
export function navigationFor(u: Who): NavLink[] {
  const shop = u?.role !== 'builder'
  const links: NavLink[] = [
    ...(shop ? [{ to: '/kits', label: 'Kits' }] : []),
    { to: '/planner', label: 'Gain Planner' },
    { to: '/safety', label: 'Safety' },
  ]
  if (!u || canBuy(u)) links.push({ to: '/cart', label: 'Cart' })
  if (!u) return links
  if (u.role === 'builder') links.unshift({ to: '/rigs', label: 'Your rigs' })
  if (canBuy(u)) links.push({ to: '/quotes', label: 'Quotes' }, { to: '/orders', label: 'Orders' })
  if (canBuy(u)) links.push({ to: '/rigs', label: 'Build spaces' })
  if (isCustomer(u)) links.push({ to: '/sheets', label: 'My sheets' })
  if (isCustomer(u)) links.push({ to: '/tickets', label: 'Tickets' })
  if (canUseHelpQueue(u)) links.push({ to: '/help-queue', label: 'Help queue' })
  if (isStaff(u)) links.push({ to: '/staff', label: 'Staff desk' })
  if (isAdmin(u)) links.push({ to: '/admin/staff', label: 'Staff accounts' })
  return links
}
