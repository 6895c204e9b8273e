// Tiltwright's tables. Money is integer cents wherever it appears; times are UTC.
// MariaDB notes: ids are unsigned bigint autoincrement (drizzle's serial() emits SQL
// MariaDB rejects); there is no RETURNING, so inserts re-select by $returningId().
import { sql } from 'drizzle-orm'
import {
  bigint, boolean, datetime, index, int, json, mysqlEnum, mysqlTable, text, uniqueIndex, varchar,
} from 'drizzle-orm/mysql-core'

const id = () => bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey()
const ref = (name: string) => bigint(name, { mode: 'number', unsigned: true })
const createdAt = () => datetime('created_at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`)

export const ROLES = ['teacher', 'builder', 'support', 'admin'] as const
export const TAX_EXEMPTION = ['none', 'pending', 'accepted', 'rejected'] as const

export const schools = mysqlTable('schools', {
  id: id(),
  name: varchar('name', { length: 160 }).notNull(),
  district: varchar('district', { length: 160 }),
  addressLine1: varchar('address_line1', { length: 160 }).notNull(),
  addressLine2: varchar('address_line2', { length: 160 }),
  city: varchar('city', { length: 100 }).notNull(),
  region: varchar('region', { length: 100 }).notNull(),
  postalCode: varchar('postal_code', { length: 20 }).notNull(),
  country: varchar('country', { length: 2 }).notNull().default('US'),
  taxExemption: mysqlEnum('tax_exemption', TAX_EXEMPTION).notNull().default('none'),
  createdAt: createdAt(),
})

export const users = mysqlTable('users', {
  id: id(),
  email: varchar('email', { length: 254 }).notNull(),
  name: varchar('name', { length: 120 }).notNull(),
  passwordHash: varchar('password_hash', { length: 255 }).notNull(),
  role: mysqlEnum('role', ROLES).notNull(),
  schoolId: ref('school_id').references(() => schools.id),
  verifiedAt: datetime('verified_at', { mode: 'date', fsp: 3 }),
  disabledAt: datetime('disabled_at', { mode: 'date', fsp: 3 }),
  createdAt: createdAt(),
}, (t) => [uniqueIndex('users_email_unique').on(t.email), index('users_school_idx').on(t.schoolId)])

/** Single-use, expiring tokens for e-mail verification and password reset; only a hash is kept. */
export const authTokens = mysqlTable('auth_tokens', {
  id: id(),
  userId: ref('user_id').notNull().references(() => users.id),
  purpose: mysqlEnum('purpose', ['verify-email', 'reset-password']).notNull(),
  tokenHash: varchar('token_hash', { length: 64 }).notNull(),
  expiresAt: datetime('expires_at', { mode: 'date', fsp: 3 }).notNull(),
  usedAt: datetime('used_at', { mode: 'date', fsp: 3 }),
  createdAt: createdAt(),
}, (t) => [uniqueIndex('auth_tokens_hash_unique').on(t.tokenHash), index('auth_tokens_user_idx').on(t.userId)])

/** Failed sign-ins, counted per account and per address to slow down guessing. */
export const signInFailures = mysqlTable('sign_in_failures', {
  id: id(),
  email: varchar('email', { length: 254 }).notNull(),
  address: varchar('address', { length: 64 }).notNull(),
  createdAt: createdAt(),
}, (t) => [index('sign_in_failures_email_idx').on(t.email, t.createdAt), index('sign_in_failures_address_idx').on(t.address, t.createdAt)])

export interface OutboxAttachment { filename: string; contentType: string; contentBase64: string }

/** Every e-mail is written here in the transaction that causes it, then delivered with retries. */
export const emailOutbox = mysqlTable('email_outbox', {
  id: id(),
  kind: varchar('kind', { length: 60 }).notNull(),
  toAddress: varchar('to_address', { length: 254 }).notNull(),
  subject: varchar('subject', { length: 200 }).notNull(),
  textBody: text('text_body').notNull(),
  htmlBody: text('html_body'),
  attachments: json('attachments').$type<OutboxAttachment[]>(),
  status: mysqlEnum('status', ['pending', 'sent', 'failed']).notNull().default('pending'),
  attempts: int('attempts').notNull().default(0),
  nextAttemptAt: datetime('next_attempt_at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  lastError: varchar('last_error', { length: 500 }),
  sentAt: datetime('sent_at', { mode: 'date', fsp: 3 }),
  createdAt: createdAt(),
}, (t) => [index('email_outbox_due_idx').on(t.status, t.nextAttemptAt)])

export const auditLog = mysqlTable('audit_log', {
  id: id(),
  actorId: ref('actor_id'),
  action: varchar('action', { length: 80 }).notNull(),
  subjectType: varchar('subject_type', { length: 40 }),
  subjectId: ref('subject_id'),
  detail: json('detail').$type<Record<string, unknown>>(),
  createdAt: createdAt(),
}, (t) => [index('audit_log_subject_idx').on(t.subjectType, t.subjectId)])

/** A saved Gain Planner run: the inputs, the results it gave, and how the real rig behaved. */
export const tuningSheets = mysqlTable('tuning_sheets', {
  id: id(),
  authorId: ref('author_id').notNull().references(() => users.id),
  rigId: ref('rig_id'),
  title: varchar('title', { length: 120 }).notNull(),
  note: text('note'),
  inputs: json('inputs').$type<Record<string, unknown>>().notNull(),
  results: json('results').$type<Record<string, unknown>>().notNull(),
  archived: boolean('archived').notNull().default(false),
  createdAt: createdAt(),
}, (t) => [index('tuning_sheets_author_idx').on(t.authorId, t.createdAt), index('tuning_sheets_rig_idx').on(t.rigId, t.createdAt)])
