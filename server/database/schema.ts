// Tiltwright's tables. Money is integer cents wherever it appears; times are UTC.
// MariaDB notes: ids are unsigned bigint autoincrement (drizzle's serial() emits SQL
// MariaDB rejects); there is no RETURNING, so inserts re-select by $returningId().
import { sql } from 'drizzle-orm'
import { ORDER_STATUSES, PAYMENT_METHODS } from '../../shared/utils/order-flow'
import { ROLES } from '../../shared/utils/roles'
import {
  JOB_STATES,
  PO_STATUSES,
  PRODUCT_KINDS,
  ATTACHMENT_KINDS,
  RESERVATION_STATUSES,
  SHIPMENT_KINDS,
  TAX_EXEMPTION_STATES,
  TICKET_PRIORITIES,
  TICKET_STATUSES,
  TOKEN_PURPOSES,
  UPLOAD_KINDS,
} from '../../shared/utils/states'
import {
  bigint,
  boolean,
  datetime,
  decimal,
  index,
  int,
  json,
  mysqlEnum,
  mysqlTable,
  text,
  uniqueIndex,
  varchar,
} from 'drizzle-orm/mysql-core'
import type { PostalAddress } from '../../shared/schemas/address'
import type { MeasuredRun, RigCalibration } from '../../shared/schemas/build'
import type { Rig } from '../../shared/utils/planner/schema'
import { CHECKLIST_STEPS, SHEET_VERDICTS } from '../../shared/utils/build'

const id = () => bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey()
const ref = (name: string) => bigint(name, { mode: 'number', unsigned: true })
const createdAt = () =>
  datetime('created_at', { mode: 'date', fsp: 3 })
    .notNull()
    .default(sql`CURRENT_TIMESTAMP(3)`)

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
  taxExemption: mysqlEnum('tax_exemption', TAX_EXEMPTION_STATES).notNull().default('none'),
  createdAt: createdAt(),
})

export const users = mysqlTable(
  'users',
  {
    id: id(),
    /** Null for a builder who joined with a code: students need no e-mail address. */
    email: varchar('email', { length: 254 }),
    /** A builder's sign-in name (lower case); null for e-mail accounts. */
    username: varchar('username', { length: 40 }),
    name: varchar('name', { length: 120 }).notNull(),
    passwordHash: varchar('password_hash', { length: 255 }).notNull(),
    role: mysqlEnum('role', ROLES).notNull(),
    schoolId: ref('school_id').references(() => schools.id),
    verifiedAt: datetime('verified_at', { mode: 'date', fsp: 3 }),
    disabledAt: datetime('disabled_at', { mode: 'date', fsp: 3 }),
    /** The last time a session was started (null: never signed in, e.g. invited staff). */
    lastSignInAt: datetime('last_sign_in_at', { mode: 'date', fsp: 3 }),
    createdAt: createdAt(),
  },
  t => [
    uniqueIndex('users_email_unique').on(t.email),
    uniqueIndex('users_username_unique').on(t.username),
    index('users_school_idx').on(t.schoolId),
  ],
)

/** Single-use, expiring tokens for e-mail verification and password reset; only a hash is kept. */
export const authTokens = mysqlTable(
  'auth_tokens',
  {
    id: id(),
    userId: ref('user_id')
      .notNull()
      .references(() => users.id),
    purpose: mysqlEnum('purpose', TOKEN_PURPOSES).notNull(),
    tokenHash: varchar('token_hash', { length: 64 }).notNull(),
    expiresAt: datetime('expires_at', { mode: 'date', fsp: 3 }).notNull(),
    usedAt: datetime('used_at', { mode: 'date', fsp: 3 }),
    createdAt: createdAt(),
  },
  t => [
    uniqueIndex('auth_tokens_hash_unique').on(t.tokenHash),
    index('auth_tokens_user_idx').on(t.userId),
  ],
)

/** A signed-in browser. The session cookie names its id; a session is good only while its row
 *  is here and not revoked, so signing out, a password change or a reset ends it at once. */
export const userSessions = mysqlTable(
  'user_sessions',
  {
    id: id(),
    userId: ref('user_id')
      .notNull()
      .references(() => users.id),
    /** SHA-256 of the random id kept in the sealed cookie. */
    tokenHash: varchar('token_hash', { length: 64 }).notNull(),
    /** A coarse label such as "Firefox on Windows": enough to recognise a device, nothing more. */
    device: varchar('device', { length: 60 }).notNull(),
    lastSeenAt: datetime('last_seen_at', { mode: 'date', fsp: 3 })
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
    revokedAt: datetime('revoked_at', { mode: 'date', fsp: 3 }),
    createdAt: createdAt(),
  },
  t => [
    uniqueIndex('user_sessions_token_unique').on(t.tokenHash),
    index('user_sessions_user_idx').on(t.userId, t.revokedAt),
  ],
)

/** Wrong passwords for one account from one address: the pair is slowed down, never the
 *  account for everyone nor the address for everyone. One row a pair, updated under a row lock. */
export const signInThrottles = mysqlTable(
  'sign_in_throttles',
  {
    id: id(),
    email: varchar('email', { length: 254 }).notNull(),
    address: varchar('address', { length: 64 }).notNull(),
    /** Attempts counted since the last success (each counted before its password is checked). */
    attempts: int('attempts').notNull().default(0),
    nextAttemptAt: datetime('next_attempt_at', { mode: 'date', fsp: 3 })
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
    updatedAt: datetime('updated_at', { mode: 'date', fsp: 3 })
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
  },
  t => [
    uniqueIndex('sign_in_throttles_pair_unique').on(t.email, t.address),
    index('sign_in_throttles_updated_idx').on(t.updatedAt),
  ],
)

/** Requests per client address, limit and window (server/utils/rate-limits.ts): counted in the
 *  database so every app instance counts the same requests. Old windows are swept. */
export const rateLimitHits = mysqlTable(
  'rate_limit_hits',
  {
    id: id(),
    bucket: varchar('bucket', { length: 40 }).notNull(),
    address: varchar('address', { length: 64 }).notNull(),
    /** The window's number: milliseconds since the epoch divided by the window's length. */
    window: bigint('window_no', { mode: 'number', unsigned: true }).notNull(),
    hits: int('hits').notNull().default(0),
    expiresAt: datetime('expires_at', { mode: 'date', fsp: 3 }).notNull(),
  },
  t => [
    uniqueIndex('rate_limit_hits_key').on(t.bucket, t.address, t.window),
    index('rate_limit_hits_expires_idx').on(t.expiresAt),
  ],
)

/**
 * Account mail sent per recipient, kind and hour: the cap on reset, verification and invitation
 * mail.
 */
export const mailQuota = mysqlTable(
  'mail_quota',
  {
    id: id(),
    recipient: varchar('recipient', { length: 254 }).notNull(),
    kind: varchar('kind', { length: 40 }).notNull(),
    hourStart: datetime('hour_start', { mode: 'date', fsp: 3 }).notNull(),
    sent: int('sent').notNull().default(0),
  },
  t => [
    uniqueIndex('mail_quota_key_unique').on(t.recipient, t.kind, t.hourStart),
    index('mail_quota_hour_idx').on(t.hourStart),
  ],
)

/** Durable work done after a transaction commits: e-mail, calls to the payment provider, the
 *  fake's webhook deliveries, sweeps. Written in the transaction of the change that causes
 *  it, claimed with SKIP LOCKED by whichever app instance is free, retried with back-off.
 *  `uniqueKey` makes a job that must exist once (an order's invoice, a sweep) idempotent. */
export const jobs = mysqlTable(
  'jobs',
  {
    id: id(),
    kind: varchar('kind', { length: 40 }).notNull(),
    payload: json('payload').$type<Record<string, unknown>>().notNull(),
    uniqueKey: varchar('unique_key', { length: 120 }),
    state: mysqlEnum('state', JOB_STATES).notNull().default('pending'),
    attempts: int('attempts').notNull().default(0),
    nextAttemptAt: datetime('next_attempt_at', { mode: 'date', fsp: 3 })
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
    lastError: varchar('last_error', { length: 500 }),
    doneAt: datetime('done_at', { mode: 'date', fsp: 3 }),
    // A committed lease (server/utils/jobs.ts): the claim of the runner that holds the job, and
    // until when. Row locks do not cross Galera nodes; a committed row does.
    claimedBy: varchar('claimed_by', { length: 64 }),
    leaseUntil: datetime('lease_until', { mode: 'date', fsp: 3 }),
    createdAt: createdAt(),
  },
  t => [
    index('jobs_due_idx').on(t.state, t.nextAttemptAt),
    uniqueIndex('jobs_unique_key').on(t.uniqueKey),
    index('jobs_kind_idx').on(t.kind, t.createdAt),
  ],
)

export const auditLog = mysqlTable(
  'audit_log',
  {
    id: id(),
    actorId: ref('actor_id'),
    action: varchar('action', { length: 80 }).notNull(),
    subjectType: varchar('subject_type', { length: 40 }),
    subjectId: ref('subject_id'),
    detail: json('detail').$type<Record<string, unknown>>(),
    createdAt: createdAt(),
  },
  t => [index('audit_log_subject_idx').on(t.subjectType, t.subjectId)],
)

/** A saved Gain Planner run: the inputs, the results it gave, and how the real rig behaved. */
export const tuningSheets = mysqlTable(
  'tuning_sheets',
  {
    id: id(),
    authorId: ref('author_id')
      .notNull()
      .references(() => users.id),
    rigId: ref('rig_id'),
    title: varchar('title', { length: 120 }).notNull(),
    note: text('note'),
    /** How the real rig behaved with these gains, in the builder's judgement. */
    verdict: mysqlEnum('verdict', SHEET_VERDICTS),
    /** What the builder measured on the real rig, if anything (shared/schemas/build.ts). */
    measured: json('measured').$type<MeasuredRun>(),
    inputs: json('inputs').$type<Record<string, unknown>>().notNull(),
    results: json('results').$type<Record<string, unknown>>().notNull(),
    archived: boolean('archived').notNull().default(false),
    createdAt: createdAt(),
  },
  t => [
    index('tuning_sheets_author_idx').on(t.authorId, t.createdAt),
    index('tuning_sheets_rig_idx').on(t.rigId, t.createdAt),
  ],
)

// ── The shop: catalog, stock in production batches, quotes, orders, payments ─────────────

export interface ProductSpec {
  label: string
  value: string
}

export const products = mysqlTable(
  'products',
  {
    id: id(),
    slug: varchar('slug', { length: 80 }).notNull(),
    name: varchar('name', { length: 120 }).notNull(),
    kind: mysqlEnum('kind', PRODUCT_KINDS).notNull(),
    summary: varchar('summary', { length: 300 }).notNull(),
    description: text('description').notNull(),
    specs: json('specs').$type<ProductSpec[]>().notNull(),
    image: varchar('image', { length: 200 }).notNull(),
    /** Packed weight, for the shipping estimate. */
    weightGrams: int('weight_grams').notNull(),
    active: boolean('active').notNull().default(true),
    sortOrder: int('sort_order').notNull().default(0),
    createdAt: createdAt(),
  },
  t => [uniqueIndex('products_slug_unique').on(t.slug)],
)

/** Classroom quantity tiers: the unit price for orders of at least minQuantity. */
export const priceTiers = mysqlTable(
  'price_tiers',
  {
    id: id(),
    productId: ref('product_id')
      .notNull()
      .references(() => products.id),
    minQuantity: int('min_quantity').notNull(),
    unitPriceCents: int('unit_price_cents').notNull(),
  },
  t => [uniqueIndex('price_tiers_product_min_unique').on(t.productId, t.minQuantity)],
)

/** A production batch: units built together. What is left is quantityBuilt − reserved. */
export const batches = mysqlTable(
  'batches',
  {
    id: id(),
    productId: ref('product_id')
      .notNull()
      .references(() => products.id),
    code: varchar('code', { length: 40 }).notNull(),
    quantityBuilt: int('quantity_built').notNull(),
    reserved: int('reserved').notNull().default(0),
    builtOn: datetime('built_on', { mode: 'date', fsp: 3 }).notNull(),
    createdAt: createdAt(),
  },
  t => [
    uniqueIndex('batches_code_unique').on(t.code),
    index('batches_product_idx').on(t.productId, t.builtOn),
  ],
)

/** The tax a quote or order was made with, kept so no document re-reads today's rates: the
 *  ship-to state and its base rate in basis points (halves occur: 687.5). Rows made before the
 *  rate followed the destination have no state and were charged the old flat 7.25 %. */
const taxColumns = () => ({
  taxRateBasisPoints: decimal('tax_rate_bp', { precision: 7, scale: 1, mode: 'number' })
    .notNull()
    .default(725),
  taxState: varchar('tax_state', { length: 2 }),
  taxExempt: boolean('tax_exempt').notNull(),
})

export const quotes = mysqlTable(
  'quotes',
  {
    id: id(),
    number: varchar('number', { length: 20 }),
    schoolId: ref('school_id')
      .notNull()
      .references(() => schools.id),
    createdById: ref('created_by_id')
      .notNull()
      .references(() => users.id),
    subtotalCents: int('subtotal_cents').notNull(),
    shippingCents: int('shipping_cents').notNull(),
    taxCents: int('tax_cents').notNull(),
    totalCents: int('total_cents').notNull(),
    ...taxColumns(),
    validUntil: datetime('valid_until', { mode: 'date', fsp: 3 }).notNull(),
    orderId: ref('order_id'),
    createdAt: createdAt(),
  },
  t => [
    uniqueIndex('quotes_number_unique').on(t.number),
    index('quotes_school_idx').on(t.schoolId, t.createdAt),
    uniqueIndex('quotes_order_unique').on(t.orderId),
  ],
)

/** A priced line as quoted or ordered: the name and tier price are copied, so later
 *  catalog changes never alter a document. */
const pricedLineColumns = () => ({
  productId: ref('product_id')
    .notNull()
    .references(() => products.id),
  name: varchar('name', { length: 120 }).notNull(),
  quantity: int('quantity').notNull(),
  tierMinQuantity: int('tier_min_quantity').notNull(),
  unitPriceCents: int('unit_price_cents').notNull(),
  lineTotalCents: int('line_total_cents').notNull(),
  /** The tier's range in the shop's words when it was priced ("10+"); null on older rows. */
  tierLabel: varchar('tier_label', { length: 30 }),
})

export const quoteLines = mysqlTable(
  'quote_lines',
  {
    id: id(),
    quoteId: ref('quote_id')
      .notNull()
      .references(() => quotes.id),
    ...pricedLineColumns(),
  },
  t => [index('quote_lines_quote_idx').on(t.quoteId)],
)

export const orders = mysqlTable(
  'orders',
  {
    id: id(),
    number: varchar('number', { length: 20 }),
    schoolId: ref('school_id')
      .notNull()
      .references(() => schools.id),
    placedById: ref('placed_by_id')
      .notNull()
      .references(() => users.id),
    quoteId: ref('quote_id'),
    status: mysqlEnum('status', ORDER_STATUSES).notNull(),
    paymentMethod: mysqlEnum('payment_method', PAYMENT_METHODS).notNull(),
    subtotalCents: int('subtotal_cents').notNull(),
    shippingCents: int('shipping_cents').notNull(),
    taxCents: int('tax_cents').notNull(),
    totalCents: int('total_cents').notNull(),
    ...taxColumns(),
    /** Where it ships and whom it bills, as set at checkout (null on orders placed before
     *  checkout asked: the school's address then stood for both). */
    shipTo: json('ship_to').$type<PostalAddress>(),
    billTo: json('bill_to').$type<PostalAddress>(),
    deliveryNote: varchar('delivery_note', { length: 200 }),
    /** The payment provider's objects for this order (customer, checkout session, invoice). */
    providerCustomerId: varchar('provider_customer_id', { length: 80 }),
    checkoutSessionId: varchar('checkout_session_id', { length: 80 }),
    checkoutUrl: varchar('checkout_url', { length: 500 }),
    invoiceId: varchar('invoice_id', { length: 80 }),
    invoiceNumber: varchar('invoice_number', { length: 40 }),
    invoiceUrl: varchar('invoice_url', { length: 500 }),
    invoiceDueAt: datetime('invoice_due_at', { mode: 'date', fsp: 3 }),
    paidAt: datetime('paid_at', { mode: 'date', fsp: 3 }),
    paymentReference: varchar('payment_reference', { length: 120 }),
    /** The provider's payment (a payment intent) behind paidAt, kept so it can be refunded. */
    paymentIntentId: varchar('payment_intent_id', { length: 80 }),
    refundedAt: datetime('refunded_at', { mode: 'date', fsp: 3 }),
    refundReference: varchar('refund_reference', { length: 80 }),
    invoiceVoidedAt: datetime('invoice_voided_at', { mode: 'date', fsp: 3 }),
    createdAt: createdAt(),
    updatedAt: datetime('updated_at', { mode: 'date', fsp: 3 })
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
  },
  t => [
    uniqueIndex('orders_number_unique').on(t.number),
    index('orders_school_idx').on(t.schoolId, t.createdAt),
    index('orders_status_idx').on(t.status, t.createdAt),
    uniqueIndex('orders_session_unique').on(t.checkoutSessionId),
    uniqueIndex('orders_invoice_unique').on(t.invoiceId),
  ],
)

export const orderLines = mysqlTable(
  'order_lines',
  {
    id: id(),
    orderId: ref('order_id')
      .notNull()
      .references(() => orders.id),
    ...pricedLineColumns(),
  },
  t => [index('order_lines_order_idx').on(t.orderId)],
)

/**
 * Units of a batch held for an order: reserved when placed, allocated by an admin, released on
 * cancel.
 */
export const stockReservations = mysqlTable(
  'stock_reservations',
  {
    id: id(),
    orderId: ref('order_id')
      .notNull()
      .references(() => orders.id),
    productId: ref('product_id')
      .notNull()
      .references(() => products.id),
    batchId: ref('batch_id')
      .notNull()
      .references(() => batches.id),
    quantity: int('quantity').notNull(),
    status: mysqlEnum('status', RESERVATION_STATUSES).notNull().default('reserved'),
    /** The replacement shipment these units left in (status `sent`). */
    shipmentId: ref('shipment_id'),
    createdAt: createdAt(),
  },
  t => [
    index('stock_reservations_order_idx').on(t.orderId),
    index('stock_reservations_batch_idx').on(t.batchId),
  ],
)

/** The order's timeline: every change, in the words the teacher sees. */
export const orderEvents = mysqlTable(
  'order_events',
  {
    id: id(),
    orderId: ref('order_id')
      .notNull()
      .references(() => orders.id),
    kind: varchar('kind', { length: 40 }).notNull(),
    message: varchar('message', { length: 500 }).notNull(),
    actorId: ref('actor_id'),
    createdAt: createdAt(),
  },
  t => [index('order_events_order_idx').on(t.orderId, t.createdAt)],
)

export const shipments = mysqlTable(
  'shipments',
  {
    id: id(),
    orderId: ref('order_id')
      .notNull()
      .references(() => orders.id),
    carrier: varchar('carrier', { length: 60 }).notNull(),
    tracking: varchar('tracking', { length: 80 }).notNull(),
    /** The order's goods, or free replacement parts sent from a ticket (`ticketId`). */
    kind: mysqlEnum('kind', SHIPMENT_KINDS).notNull().default('order'),
    ticketId: ref('ticket_id'),
    createdById: ref('created_by_id')
      .notNull()
      .references(() => users.id),
    shippedAt: createdAt(),
  },
  t => [index('shipments_order_idx').on(t.orderId), index('shipments_ticket_idx').on(t.ticketId)],
)

/** What a replacement shipment carried (an order's own shipment carries its lines). */
export const shipmentItems = mysqlTable(
  'shipment_items',
  {
    id: id(),
    shipmentId: ref('shipment_id')
      .notNull()
      .references(() => shipments.id),
    productId: ref('product_id')
      .notNull()
      .references(() => products.id),
    quantity: int('quantity').notNull(),
  },
  t => [index('shipment_items_shipment_idx').on(t.shipmentId)],
)

export const purchaseOrders = mysqlTable(
  'purchase_orders',
  {
    id: id(),
    orderId: ref('order_id')
      .notNull()
      .references(() => orders.id),
    poNumber: varchar('po_number', { length: 60 }).notNull(),
    apEmail: varchar('ap_email', { length: 254 }).notNull(),
    status: mysqlEnum('status', PO_STATUSES).notNull().default('review'),
    rejectReason: varchar('reject_reason', { length: 500 }),
    reviewedById: ref('reviewed_by_id'),
    reviewedAt: datetime('reviewed_at', { mode: 'date', fsp: 3 }),
    createdAt: createdAt(),
  },
  t => [uniqueIndex('purchase_orders_order_unique').on(t.orderId)],
)

/** Uploaded documents (PO files, tax certificates), kept in Nitro storage under `storageKey`. */
export const storedFiles = mysqlTable(
  'stored_files',
  {
    id: id(),
    kind: mysqlEnum('kind', UPLOAD_KINDS).notNull(),
    schoolId: ref('school_id')
      .notNull()
      .references(() => schools.id),
    orderId: ref('order_id'),
    storageKey: varchar('storage_key', { length: 120 }).notNull(),
    filename: varchar('filename', { length: 200 }).notNull(),
    contentType: varchar('content_type', { length: 80 }).notNull(),
    size: int('size').notNull(),
    uploadedById: ref('uploaded_by_id')
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
  },
  t => [
    index('stored_files_order_idx').on(t.orderId),
    index('stored_files_school_idx').on(t.schoolId, t.kind),
  ],
)

/** Each payment-provider event is handled once: its id is the key. */
export const paymentEvents = mysqlTable('payment_events', {
  id: varchar('id', { length: 80 }).primaryKey(),
  type: varchar('type', { length: 80 }).notNull(),
  receivedAt: createdAt(),
})

// ── The local fake of the payment provider (server/fake-payments/), used only in fake mode ──

/**
 * Every object the fake keeps (customers, checkout sessions, invoices, payment intents, events).
 */
export const fakePaymentObjects = mysqlTable(
  'fake_payment_objects',
  {
    id: varchar('id', { length: 80 }).primaryKey(),
    type: varchar('type', { length: 40 }).notNull(),
    data: json('data').$type<Record<string, unknown>>().notNull(),
    createdAt: createdAt(),
  },
  t => [index('fake_payment_objects_type_idx').on(t.type, t.createdAt)],
)

// ── Build spaces: a paid order's kits become rigs that its students build and tune ─────────
// The build space of an order is its rigs, its join codes and its members; it opens when the
// order is paid or its purchase order approved (server/utils/build-spaces.ts).

/** One kit unit of an order, as the class builds it. */
export const rigs = mysqlTable(
  'rigs',
  {
    id: id(),
    orderId: ref('order_id')
      .notNull()
      .references(() => orders.id),
    /** Printed on the kit's label: the order number and the unit ("TW-10007-03"). */
    serial: varchar('serial', { length: 40 }).notNull(),
    /** The teacher's name for it; the serial when not set. */
    name: varchar('name', { length: 60 }),
    /** The teacher's grouping, such as "Bench 3" or "Period 2". */
    groupLabel: varchar('group_label', { length: 40 }),
    retiredAt: datetime('retired_at', { mode: 'date', fsp: 3 }),
    /** The rig as measured, in the planner's SI units; null until someone saves it. */
    dimensions: json('dimensions').$type<Rig>(),
    dimensionsUpdatedAt: datetime('dimensions_updated_at', { mode: 'date', fsp: 3 }),
    /** The rail sensor's calibration readings and fit; null until calibrated. */
    calibration: json('calibration').$type<RigCalibration>(),
    calibratedAt: datetime('calibrated_at', { mode: 'date', fsp: 3 }),
    /** The last tick, note, sheet or measurement on this rig. */
    lastActivityAt: datetime('last_activity_at', { mode: 'date', fsp: 3 }),
    createdAt: createdAt(),
  },
  t => [uniqueIndex('rigs_serial_unique').on(t.serial), index('rigs_order_idx').on(t.orderId)],
)

/** A rig's build checklist: one row per step that someone has touched. */
export const rigSteps = mysqlTable(
  'rig_steps',
  {
    id: id(),
    rigId: ref('rig_id')
      .notNull()
      .references(() => rigs.id),
    step: mysqlEnum('step', CHECKLIST_STEPS).notNull(),
    doneAt: datetime('done_at', { mode: 'date', fsp: 3 }),
    doneById: ref('done_by_id'),
    note: varchar('note', { length: 300 }),
    updatedById: ref('updated_by_id'),
    updatedAt: datetime('updated_at', { mode: 'date', fsp: 3 })
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
  },
  t => [uniqueIndex('rig_steps_rig_step_unique').on(t.rigId, t.step)],
)

/** Who belongs to an order's build space, and the rig each builder works on. */
export const buildMembers = mysqlTable(
  'build_members',
  {
    id: id(),
    orderId: ref('order_id')
      .notNull()
      .references(() => orders.id),
    userId: ref('user_id')
      .notNull()
      .references(() => users.id),
    rigId: ref('rig_id'),
    joinCodeId: ref('join_code_id'),
    joinedAt: createdAt(),
  },
  t => [
    uniqueIndex('build_members_order_user_unique').on(t.orderId, t.userId),
    index('build_members_user_idx').on(t.userId),
    index('build_members_rig_idx').on(t.rigId),
  ],
)

/** A code a teacher hands the class to join the build space. Kept readable: the teacher shows it
 *  again on the projector; it is short-lived, can be limited in uses and revoked. */
export const joinCodes = mysqlTable(
  'join_codes',
  {
    id: id(),
    orderId: ref('order_id')
      .notNull()
      .references(() => orders.id),
    code: varchar('code', { length: 16 }).notNull(),
    expiresAt: datetime('expires_at', { mode: 'date', fsp: 3 }).notNull(),
    maxUses: int('max_uses'),
    uses: int('uses').notNull().default(0),
    revokedAt: datetime('revoked_at', { mode: 'date', fsp: 3 }),
    createdById: ref('created_by_id')
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
  },
  t => [
    uniqueIndex('join_codes_code_unique').on(t.code),
    index('join_codes_order_idx').on(t.orderId),
  ],
)

// ── Tickets: a builder or teacher asks for help on a rig or an order; support answers ──────
// docs/tickets.md. The customer side never reads a row of ticket_messages with internal = true.

export const tickets = mysqlTable(
  'tickets',
  {
    id: id(),
    /** The school whose teacher sees it (the order's school). */
    schoolId: ref('school_id')
      .notNull()
      .references(() => schools.id),
    orderId: ref('order_id')
      .notNull()
      .references(() => orders.id),
    /** The rig it is about; null for a ticket on the order as a whole. */
    rigId: ref('rig_id'),
    subject: varchar('subject', { length: 120 }).notNull(),
    status: mysqlEnum('status', TICKET_STATUSES).notNull().default('needs reply'),
    priority: mysqlEnum('priority', TICKET_PRIORITIES).notNull().default('normal'),
    /** The staff member working it; null while unassigned. */
    assigneeId: ref('assignee_id'),
    openedById: ref('opened_by_id')
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    /** The last message or note (the queue's "last activity"). */
    lastMessageAt: datetime('last_message_at', { mode: 'date', fsp: 3 })
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
    /** When the status last changed (the queue's "waiting since"). */
    statusChangedAt: datetime('status_changed_at', { mode: 'date', fsp: 3 })
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
    resolvedAt: datetime('resolved_at', { mode: 'date', fsp: 3 }),
  },
  t => [
    index('tickets_school_idx').on(t.schoolId, t.createdAt),
    index('tickets_order_idx').on(t.orderId),
    index('tickets_rig_idx').on(t.rigId),
    index('tickets_queue_idx').on(t.status, t.priority, t.createdAt),
    index('tickets_assignee_idx').on(t.assigneeId, t.status),
    // The help queue's sorts, filtered or not, read in index order rather than sorting every
    // match (docs/benchmarks.md, 50 000 tickets). A descending sort keeps ties by id ascending,
    // so its index is descending too (InnoDB appends the id ascending).
    index('tickets_created_idx').on(t.createdAt),
    index('tickets_created_desc_idx').on(sql`${t.createdAt} desc`),
    index('tickets_activity_desc_idx').on(sql`${t.lastMessageAt} desc`),
    index('tickets_status_created_idx').on(t.status, t.createdAt),
    index('tickets_status_activity_desc_idx').on(t.status, sql`${t.lastMessageAt} desc`),
    index('tickets_priority_created_idx').on(t.priority, t.createdAt),
    // Counts a priority's open tickets from the index alone (the queue's total for a page).
    index('tickets_priority_status_idx').on(t.priority, t.status),
    index('tickets_assignee_priority_desc_idx').on(t.assigneeId, sql`${t.priority} desc`),
  ],
)

/** A ticket's thread: messages both sides see, and the staff's internal notes. */
export const ticketMessages = mysqlTable(
  'ticket_messages',
  {
    id: id(),
    ticketId: ref('ticket_id')
      .notNull()
      .references(() => tickets.id),
    authorId: ref('author_id')
      .notNull()
      .references(() => users.id),
    /** A staff note: never in a customer's reply, page or e-mail. */
    internal: boolean('internal').notNull().default(false),
    body: text('body').notNull(),
    /** A tuning sheet attached to the message (staff see it inline). */
    sheetId: ref('sheet_id'),
    /** The stock reply the staff member started from, if any. */
    stockReplyId: ref('stock_reply_id'),
    createdAt: createdAt(),
  },
  t => [index('ticket_messages_ticket_idx').on(t.ticketId, t.createdAt)],
)

/** A file sent with a message: uploaded first (no message yet, only its uploader sees it), then
 *  claimed by the message that sends it. Kept in Nitro storage under `storageKey`. */
export const ticketAttachments = mysqlTable(
  'ticket_attachments',
  {
    id: id(),
    ticketId: ref('ticket_id'),
    messageId: ref('message_id'),
    kind: mysqlEnum('kind', ATTACHMENT_KINDS).notNull(),
    storageKey: varchar('storage_key', { length: 120 }).notNull(),
    filename: varchar('filename', { length: 200 }).notNull(),
    contentType: varchar('content_type', { length: 80 }).notNull(),
    size: int('size').notNull(),
    /** Pixels, for images (checked against a limit before storing). */
    width: int('width'),
    height: int('height'),
    uploadedById: ref('uploaded_by_id')
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
  },
  t => [
    index('ticket_attachments_message_idx').on(t.messageId),
    index('ticket_attachments_uploader_idx').on(t.uploadedById, t.messageId),
  ],
)

/** Saved answers support inserts into a reply and edits before sending. */
export const stockReplies = mysqlTable(
  'stock_replies',
  {
    id: id(),
    title: varchar('title', { length: 80 }).notNull(),
    body: text('body').notNull(),
    createdById: ref('created_by_id')
      .notNull()
      .references(() => users.id),
    updatedAt: datetime('updated_at', { mode: 'date', fsp: 3 })
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
    archivedAt: datetime('archived_at', { mode: 'date', fsp: 3 }),
    createdAt: createdAt(),
  },
  t => [uniqueIndex('stock_replies_title_unique').on(t.title)],
)
