// Staff accounts as the admin's staff page sees them, and the admin's changes to them: a new
// role, disabled (every session ends at once) or enabled again. An admin never disables or
// demotes themselves, and the last active admin stays.
import { and, asc, eq, isNull } from 'drizzle-orm'
import type { UpdateStaffInput } from '../../shared/schemas/staff'
import type { StaffMember } from '../../shared/types/staff'
import { isStaff, type SessionUser, type StaffRole } from '../../shared/utils/roles'
import { users } from '../database/schema'

type UserRow = typeof users.$inferSelect

export function staffMemberOf(u: UserRow): StaffMember {
  return {
    id: u.id,
    name: u.name,
    email: mailAddressOf(u),
    role: u.role as StaffRole,
    status: u.disabledAt ? 'disabled' : u.lastSignInAt ? 'active' : 'invited',
    createdAt: u.createdAt.toISOString(),
    lastSignInAt: u.lastSignInAt?.toISOString() ?? null,
  }
}

const isActiveAdmin = (u: UserRow) => u.role === 'admin' && !u.disabledAt

export async function updateStaffMember(
  admin: SessionUser,
  id: number,
  change: UpdateStaffInput,
): Promise<StaffMember> {
  if (id === admin.id && change.disabled === true)
    throw conflict('You cannot disable your own account.', 'own-account', {
      disabled: 'You cannot disable your own account.',
    })
  if (id === admin.id && change.role && change.role !== 'admin')
    throw conflict('You cannot change your own role.', 'own-account', {
      role: 'You cannot change your own role.',
    })
  return transactionWithRetry(async (tx) => {
    // The active admins first, in id order: two admins changing each other queue here, so the
    // count below is the truth when the change is written.
    const admins = await tx
      .select()
      .from(users)
      .where(and(eq(users.role, 'admin'), isNull(users.disabledAt)))
      .orderBy(asc(users.id))
      .for('update')
    if (!admins.some(a => a.id === admin.id)) throw forbidden()
    const [target] = await tx.select().from(users).where(eq(users.id, id)).limit(1).for('update')
    if (!target || !isStaff(target)) throw notFound('That staff account')
    const demoted = change.role !== undefined && change.role !== target.role
    const disabling = change.disabled === true && !target.disabledAt
    const enabling = change.disabled === false && !!target.disabledAt
    if (isActiveAdmin(target) && (demoted || disabling) && admins.length <= 1) {
      const field = disabling ? 'disabled' : 'role'
      const message = 'This is the last active admin; make another admin first.'
      throw conflict(message, 'last-admin', { [field]: message })
    }
    if (!demoted && !disabling && !enabling) return staffMemberOf(target)
    const set: Partial<UserRow> = {}
    if (demoted) set.role = change.role
    if (disabling) set.disabledAt = new Date()
    if (enabling) set.disabledAt = null
    await tx.update(users).set(set).where(eq(users.id, id))
    if (disabling) await revokeSessions(tx, id)
    await audit(tx, {
      actorId: admin.id,
      action: 'staff.updated',
      subjectType: 'user',
      subjectId: id,
      detail: {
        ...(demoted ? { role: { from: target.role, to: change.role } } : {}),
        ...(disabling || enabling ? { disabled: disabling } : {}),
      },
    })
    return staffMemberOf({ ...target, ...set })
  })
}
