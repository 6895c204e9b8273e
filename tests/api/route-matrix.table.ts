// The role × route table: for every API route (keyed `METHOD /path`, as tests/helpers/routes.ts
// reads them from the route files) the answer each of seven callers must get, and how to call
// it: the path filled with resources of school A and A's build space, and a valid body, so that
// a 404 is the authorization answer and not a refused body. tests/api/route-matrix.test.ts walks
// it; tests/api/fuzz-bodies.test.ts takes each write route's caller and valid body from it.
import { expect } from 'vitest'
import { DEFAULT_TARGETS, KIT_PRESETS } from '../../shared/utils/planner/presets'
import { planGains } from '../../shared/utils/planner/plan'
import {
  BUILDER_PASSWORD,
  board,
  freshUsername,
  joinAs,
  newCode,
  orderOfKits,
} from '../helpers/build'
import { Client, uniqueEmail } from '../helpers/client'
import { PNG_BYTES, poForm, productWithStock, signedIn } from '../helpers/shop'
import { openTicket, ticketSpace, uploaded, validPng } from '../helpers/tickets'

export const CALLERS = [
  'anonymous',
  'teacherA',
  'teacherB',
  'builderA',
  'builderB',
  'support',
  'admin',
] as const
export type Caller = typeof CALLERS[number]

/** An expected answer: one status, or a small set where either is right (named per row). */
export type Expected = number | number[]
export type Expectations = Record<Caller, Expected>

/**
 * The seven answers in the order of CALLERS: anonymous, teacher of school A, teacher of school
 * B, builder of A's build space, builder of B's, support, admin. 401 = signed out, 403 = the
 * wrong role, 404 = the caller may not see that resource (it does not leak that it exists).
 */
function E(...answers: Expected[]): Expectations {
  if (answers.length !== CALLERS.length) throw new Error('seven answers, one per caller')
  return Object.fromEntries(CALLERS.map((c, i) => [c, answers[i]!])) as Expectations
}
/** The same answer for everyone. */
const all = (s: Expected) => E(s, s, s, s, s, s, s)

export const SEED_PASSWORD = 'tiltwright-demo'
export const TEACHER_PASSWORD = 'a-long-password-1'
const SCHOOL_ADDRESS = {
  addressLine1: '1 Test Lane',
  city: 'Ridgeford',
  region: 'CA',
  postalCode: '95999',
}
const rig = KIT_PRESETS[0]!.rig
const sheetInputs = () => ({
  rig,
  targets: DEFAULT_TARGETS,
  gains: { ...planGains(rig, DEFAULT_TARGETS).gains! },
})
const unique = () => `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`

/** How to sign a caller in again (a fresh session), and who it is. */
export interface Identity {
  login: { email: string, password: string } | { username: string, password: string } | null
  name: string
}

/** Everything the rows point at: resources of school A, A's build space, and the callers. */
export interface Fixtures {
  clients: Record<Caller, Client>
  who: Record<Caller, Identity>
  orderA: number
  /** An order of school A under purchase-order review, for the admin's order steps. */
  orderForAdmin: number
  /** An order of school A under review that its teacher may cancel. */
  orderToCancel: number
  quoteA: number
  fileA: string
  rigA: number
  rigA2: number
  codeA: string
  codeIdA: number
  /** A second builder of A's space, whom A's teacher moves, resets and removes. */
  builderA2: number
  sheetA: number
  sheetFile: unknown
  ticketA: number
  attachmentA: number
  productId: number
  productSlug: string
  batchId: number
  stockReplyId: number
  staffId: number
}

/** A fresh client signed in as `caller` (anonymous: a new cookie jar). */
export async function freshClient(f: Fixtures, caller: Caller) {
  const c = new Client()
  const login = f.who[caller].login
  if (login) {
    const r = await c.post('/api/auth/login', login)
    if (r.status !== 200) throw new Error(`sign-in of ${caller}: ${r.status}`)
  }
  return c
}

async function nameOf(c: Client) {
  return ((await c.get('/api/account')).body.user.name) as string
}

export async function buildFixtures(tag: string): Promise<Fixtures> {
  const admin = await signedIn('admin@tiltwright.test')
  const support = await signedIn('support@tiltwright.test')
  const A = await ticketSpace(`${tag}a`)
  const B = await orderOfKits(`${tag}b`, 1)
  const builderB = await joinAs((await newCode(B.teacher.client, B.orderId)).code, 'Cy D.')
  const spare = await joinAs((await newCode(A.teacher.client, A.orderId)).code, 'Di E.')
  const part = await productWithStock(admin, 500)
  const teacherA = A.teacher.client
  const builderA = A.one.client

  const lines = [{ productId: part.productId, quantity: 1 }]
  const quote = await teacherA.post('/api/quotes', { lines })
  expect(quote.status).toBe(201)
  const view = (await teacherA.get(`/api/orders/${A.orderId}`)).body
  const fileA = view.documents.find((d: any) => d.kind === 'purchase-order').url.split('/').pop()
  const { code: codeA } = await newCode(teacherA, A.orderId)
  const codeIdA = (await board(teacherA, A.orderId)).joinCodes
    .find((c: any) => c.code === codeA).id as number
  const sheet = await builderA.post('/api/sheets', {
    title: 'Matrix sheet',
    rigId: A.rigs[0]!.id,
    inputs: sheetInputs(),
  })
  expect(sheet.status, JSON.stringify(sheet.body)).toBe(201)
  const sheetFile = (await builderA.get(`/api/sheets/${sheet.body.id}/export`)).body
  const ticketA = await openTicket(builderA, { rigId: A.rigs[0]!.id })
  const file = await uploaded(builderA, validPng(8, 8), 'beam.png')
  const msg = await builderA.post(`/api/tickets/${ticketA}/messages`, {
    body: 'A photo of the beam.',
    attachmentIds: [file.id],
  })
  expect(msg.status, JSON.stringify(msg.body)).toBe(201)
  const reply = await support.post('/api/stock-replies', {
    title: `Matrix reply ${unique()}`,
    body: 'Check the linkage first.',
  })
  expect(reply.status, JSON.stringify(reply.body)).toBe(201)
  const staff = await admin.post('/api/admin/staff', {
    name: 'Matrix Colleague',
    email: uniqueEmail('matrix-staff'),
    role: 'support',
  })
  expect(staff.status, JSON.stringify(staff.body)).toBe(201)

  const clients: Record<Caller, Client> = {
    anonymous: new Client(),
    teacherA,
    teacherB: B.teacher.client,
    builderA,
    builderB: builderB.client,
    support,
    admin,
  }
  const who: Record<Caller, Identity> = {
    anonymous: { login: null, name: '' },
    teacherA: { login: { email: A.teacher.email, password: TEACHER_PASSWORD }, name: '' },
    teacherB: { login: { email: B.teacher.email, password: TEACHER_PASSWORD }, name: '' },
    builderA: { login: { username: A.one.username, password: BUILDER_PASSWORD }, name: '' },
    builderB: { login: { username: builderB.username, password: BUILDER_PASSWORD }, name: '' },
    support: { login: { email: 'support@tiltwright.test', password: SEED_PASSWORD }, name: '' },
    admin: { login: { email: 'admin@tiltwright.test', password: SEED_PASSWORD }, name: '' },
  }
  for (const c of CALLERS) if (c !== 'anonymous') who[c].name = await nameOf(clients[c])
  const f: Fixtures = {
    clients,
    who,
    orderA: A.orderId,
    orderForAdmin: 0,
    orderToCancel: 0,
    quoteA: quote.body.id,
    fileA,
    rigA: A.rigs[0]!.id,
    rigA2: A.rigs[1]!.id,
    codeA,
    codeIdA,
    builderA2: spare.user.id,
    sheetA: sheet.body.id,
    sheetFile,
    ticketA,
    attachmentA: file.id,
    productId: part.productId,
    productSlug: part.slug,
    batchId: part.batchId,
    stockReplyId: reply.body.id,
    staffId: staff.body.id,
  }
  f.orderForAdmin = await newOrderOfA(f)
  f.orderToCancel = await newOrderOfA(f)
  return f
}

/** One row: how to call the route, and what each caller gets. */
export interface Row {
  expect: Expectations
  /** The path, filled with A's resources (may make a resource of its own). */
  path: (f: Fixtures, caller: Caller) => string | Promise<string>
  /** For a caller who is let through, a path of its own (a throwaway resource). */
  okPath?: (f: Fixtures, caller: Caller) => string | Promise<string>
  /** A valid body (a new FormData each call for multipart routes). */
  body?: (f: Fixtures, caller: Caller) => unknown
  /** Ends or replaces the caller's session: called with a fresh client, after everything else. */
  fresh?: true
  /** Undoes what a successful call changed that other test files rely on. */
  undo?: (f: Fixtures, caller: Caller, body: unknown) => Promise<void>
}

const p = (s: string) => () => s
const order = (tail = '') => (f: Fixtures) => `/api/orders/${f.orderA}${tail}`
/**
 * An admin's order step: everyone but the admin is refused on A's own order; the admin walks an
 * order of its own through the steps in the table's order (`admin`: what that step answers
 * there; 409 once the order has moved past the step).
 */
const adminOrder = (step: string, admin: Expected, body?: Row['body']): Row => ({
  path: f => `/api/admin/orders/${f.orderA}/${step}`,
  okPath: f => `/api/admin/orders/${f.orderForAdmin}/${step}`,
  body,
  expect: E(401, 403, 403, 403, 403, 403, admin),
})
const school = () => ({ ...SCHOOL_ADDRESS })
const ticketFile = () => {
  const f = new FormData()
  f.set('file', new Blob([new Uint8Array(PNG_BYTES)], { type: 'image/png' }), 'matrix.png')
  return f
}
/** A new order of school A, placed with a purchase order and waiting for review. */
async function newOrderOfA(f: Fixtures) {
  const r = await f.clients.teacherA.post('/api/checkout/purchase-order', poForm({
    lines: [{ productId: f.productId, quantity: 1 }],
  }))
  if (r.status !== 201) throw new Error(`order of A: ${r.status} ${JSON.stringify(r.body)}`)
  return r.body.orderId as number
}
async function newStockReply(f: Fixtures) {
  const r = await f.clients.support.post('/api/stock-replies', {
    title: `Throwaway ${unique()}`,
    body: 'To be archived.',
  })
  return `/api/stock-replies/${r.body.id}`
}
async function pendingUpload(f: Fixtures, caller: Caller) {
  const r = await f.clients[caller].post('/api/ticket-attachments', ticketFile())
  return `/api/ticket-attachments/${r.body.id}`
}
async function newJoinCode(f: Fixtures) {
  const { code } = await newCode(f.clients.teacherA, f.orderA)
  const id = (await board(f.clients.teacherA, f.orderA)).joinCodes
    .find((c: any) => c.code === code).id
  return `/api/orders/${f.orderA}/join-codes/${id}/revoke`
}

export const okSet = (e: Expected) => (Array.isArray(e) ? e : [e])
export const succeeds = (e: Expected) => okSet(e).some(s => s < 300)
/** The caller is turned away (signed out, wrong role, may not see it), whatever the body. */
export const refused = (e: Expected) => okSet(e).every(s => [401, 403, 404].includes(s))

/**
 * Who passes authentication and authorization for a row (the fuzzed bodies are sent as them):
 * a public route's anonymous caller first, then school A's people, then staff.
 */
export function authorizedCaller(row: Row): Caller {
  const order: Caller[] = ['anonymous', 'teacherA', 'builderA', 'admin', 'support']
  return order.find(c => succeeds(row.expect[c]))
    ?? order.find(c => !refused(row.expect[c]))
    ?? 'admin'
}

export const TABLE: Record<string, Row> = {
  // nuxt-auth-utils' own endpoint: reading says who is signed in (nobody: {}), DELETE clears
  // the cookie.
  'GET /api/_auth/session': { path: p('/api/_auth/session'), expect: all(200) },
  'DELETE /api/_auth/session': { path: p('/api/_auth/session'), fresh: true, expect: all(200) },
  // A CSRF token for a page served as a shared snapshot: anyone, signed in or not.
  'GET /api/csrf-token': { path: p('/api/csrf-token'), expect: all(200) },

  'GET /api/account': { path: p('/api/account'), expect: E(401, 200, 200, 200, 200, 200, 200) },
  // The caller's own name again, so that the seed accounts keep theirs for other test files.
  'PATCH /api/account': {
    path: p('/api/account'),
    body: (f, c) => ({ name: f.who[c].name || 'Nobody' }),
    expect: E(401, 200, 200, 200, 200, 200, 200),
  },
  'POST /api/account/password': {
    path: p('/api/account/password'),
    fresh: true,
    body: (f, c) => ({
      currentPassword: f.who[c].login?.password ?? 'not-signed-in-1',
      newPassword: 'matrix-temporary-password-9',
    }),
    // The password just set is put back, so that later sign-ins (and other files) still work.
    undo: async (f, c, body) => {
      const login = f.who[c].login!
      const now = (body as { newPassword: string }).newPassword
      const back = new Client()
      const id = 'email' in login ? { email: login.email } : { username: login.username }
      await back.post('/api/auth/login', { ...id, password: now })
      const r = await back.post('/api/account/password', {
        currentPassword: now,
        newPassword: login.password,
      })
      if (r.status !== 200) throw new Error(`password of ${c} not restored: ${r.status}`)
    },
    expect: E(401, 200, 200, 200, 200, 200, 200),
  },
  'PATCH /api/account/school': {
    path: p('/api/account/school'),
    body: school,
    expect: E(401, 200, 200, 403, 403, 403, 403),
  },
  'GET /api/account/sessions': {
    path: p('/api/account/sessions'),
    expect: E(401, 200, 200, 200, 200, 200, 200),
  },
  'DELETE /api/account/sessions': {
    path: p('/api/account/sessions'),
    fresh: true,
    expect: E(401, 200, 200, 200, 200, 200, 200),
  },

  'GET /api/admin/batches': {
    path: p('/api/admin/batches'),
    expect: E(401, 403, 403, 403, 403, 403, 200),
  },
  'POST /api/admin/batches': {
    path: p('/api/admin/batches'),
    body: f => ({ productId: f.productId, code: `M-${unique()}`, quantity: 1 }),
    expect: E(401, 403, 403, 403, 403, 403, 201),
  },
  'PATCH /api/admin/batches/:id': {
    path: f => `/api/admin/batches/${f.batchId}`,
    body: () => ({ quantity: 500 }),
    expect: E(401, 403, 403, 403, 403, 403, 200),
  },
  'GET /api/admin/orders': {
    path: p('/api/admin/orders'),
    expect: E(401, 403, 403, 403, 403, 403, 200),
  },
  // In the order the steps make sense for the admin's own order under review.
  'POST /api/admin/orders/:id/approve': adminOrder('approve', 200, () => ({})),
  // Approving issued the invoice, so trying it again is refused: the step is not open (409).
  'POST /api/admin/orders/:id/invoice': adminOrder('invoice', 409, () => ({})),
  'POST /api/admin/orders/:id/allocate': adminOrder('allocate', 200, () => ({})),
  'POST /api/admin/orders/:id/payments': adminOrder(
    'payments', 200,
    () => ({ reference: 'CHQ-1001' }),
  ),
  'POST /api/admin/orders/:id/shipments': adminOrder('shipments', 201, () => ({
    carrier: 'ups',
    tracking: 'PW123456',
  })),
  'POST /api/admin/orders/:id/deliver': adminOrder('deliver', 200, () => ({})),
  // Refusing and cancelling end an order: the admin does each to a new order of school A.
  'POST /api/admin/orders/:id/reject': {
    ...adminOrder('reject', 200, () => ({ reason: 'The PO is unsigned.' })),
    okPath: async f => `/api/admin/orders/${await newOrderOfA(f)}/reject`,
  },
  'POST /api/admin/orders/:id/cancel': {
    ...adminOrder('cancel', 200, () => ({ reason: 'Ordered twice by mistake.' })),
    okPath: async f => `/api/admin/orders/${await newOrderOfA(f)}/cancel`,
  },
  'GET /api/admin/products': {
    path: p('/api/admin/products'),
    expect: E(401, 403, 403, 403, 403, 403, 200),
  },
  'POST /api/admin/products': {
    path: p('/api/admin/products'),
    body: () => ({
      slug: `matrix-${unique()}`,
      name: 'Matrix spacer',
      kind: 'part',
      summary: 'A spacer made for the role matrix.',
      weightGrams: 10,
      active: false,
      tiers: [{ minQuantity: 1, unitPriceCents: 100 }],
    }),
    expect: E(401, 403, 403, 403, 403, 403, 201),
  },
  'PATCH /api/admin/products/:id': {
    path: f => `/api/admin/products/${f.productId}`,
    body: () => ({ summary: 'A part made for one test.' }),
    expect: E(401, 403, 403, 403, 403, 403, 200),
  },
  'GET /api/admin/staff': {
    path: p('/api/admin/staff'),
    expect: E(401, 403, 403, 403, 403, 403, 200),
  },
  'POST /api/admin/staff': {
    path: p('/api/admin/staff'),
    body: () => ({ name: 'Matrix Hire', email: uniqueEmail('matrix-hire'), role: 'support' }),
    expect: E(401, 403, 403, 403, 403, 403, 201),
  },
  'PATCH /api/admin/staff/:id': {
    path: f => `/api/admin/staff/${f.staffId}`,
    body: () => ({ role: 'support' }),
    expect: E(401, 403, 403, 403, 403, 403, 200),
  },

  // Public account routes answer everyone alike (nothing says whether an address is known).
  'POST /api/auth/forgot-password': {
    path: p('/api/auth/forgot-password'),
    body: () => ({ email: uniqueEmail('matrix-forgot') }),
    expect: all(202),
  },
  'POST /api/auth/login': {
    path: p('/api/auth/login'),
    fresh: true,
    body: (f, c) => f.who[c].login ?? f.who.teacherA.login,
    expect: all(200),
  },
  'POST /api/auth/logout': { path: p('/api/auth/logout'), fresh: true, expect: all(200) },
  'POST /api/auth/register': {
    path: p('/api/auth/register'),
    body: () => ({
      name: 'Matrix Newcomer',
      email: uniqueEmail('matrix-register'),
      password: TEACHER_PASSWORD,
      school: { name: `Matrix School ${unique()}`, ...SCHOOL_ADDRESS },
    }),
    expect: all(201),
  },
  'POST /api/auth/resend-verification': {
    path: p('/api/auth/resend-verification'),
    expect: E(401, 200, 200, 200, 200, 200, 200),
  },
  // No valid link exists for these callers: everyone gets the same refusal of the link (400,
  // "expired or already used", as for a spent one).
  'POST /api/auth/reset-password': {
    path: p('/api/auth/reset-password'),
    body: () => ({ token: 'a'.repeat(43), password: 'matrix-new-password-1' }),
    expect: all(400),
  },
  'POST /api/auth/verify-email': {
    path: p('/api/auth/verify-email'),
    body: () => ({ token: 'a'.repeat(43) }),
    expect: all(400),
  },

  'GET /api/build-spaces': {
    path: p('/api/build-spaces'),
    expect: E(401, 200, 200, 200, 200, 200, 200),
  },
  // Pricing a cart is a read of public prices: everyone but a builder (who never sees a price).
  'POST /api/cart/price': {
    path: p('/api/cart/price'),
    body: f => ({ lines: [{ productId: f.productId, quantity: 2 }] }),
    expect: E(200, 200, 200, 403, 403, 200, 200),
  },
  // A's quote: B's teacher cannot turn it into an order.
  'POST /api/checkout/card': {
    path: p('/api/checkout/card'),
    body: f => ({ quoteId: f.quoteA }),
    expect: E(401, 201, 404, 403, 403, 403, 403),
  },
  'POST /api/checkout/purchase-order': {
    path: p('/api/checkout/purchase-order'),
    body: f => poForm({ lines: [{ productId: f.productId, quantity: 1 }] }),
    expect: E(401, 201, 201, 403, 403, 403, 403),
  },

  'GET /api/help-queue': {
    path: p('/api/help-queue'),
    expect: E(401, 403, 403, 403, 403, 200, 200),
  },
  'GET /api/help-queue/options': {
    path: p('/api/help-queue/options'),
    expect: E(401, 403, 403, 403, 403, 200, 200),
  },
  'POST /api/help-queue/assign': {
    path: p('/api/help-queue/assign'),
    body: f => ({ ticketIds: [f.ticketA], assigneeId: null }),
    expect: E(401, 403, 403, 403, 403, 200, 200),
  },

  'POST /api/join/check': {
    path: p('/api/join/check'),
    body: f => ({ code: f.codeA }),
    expect: all(200),
  },
  'POST /api/join': {
    path: p('/api/join'),
    fresh: true,
    body: f => ({
      code: f.codeA,
      name: 'Matrix Student',
      username: freshUsername('mx'),
      password: BUILDER_PASSWORD,
    }),
    expect: all(201),
  },

  'GET /api/orders': { path: p('/api/orders'), expect: E(401, 200, 200, 403, 403, 403, 403) },
  'GET /api/orders/:id': { path: order(), expect: E(401, 200, 404, 404, 404, 200, 200) },
  'GET /api/orders/:id/board': {
    path: order('/board'),
    expect: E(401, 200, 404, 404, 404, 200, 200),
  },
  'PATCH /api/orders/:id/builders/:userId': {
    path: f => `/api/orders/${f.orderA}/builders/${f.builderA2}`,
    body: f => ({ rigId: f.rigA2 }),
    expect: E(401, 200, 404, 404, 404, 404, 404),
  },
  'POST /api/orders/:id/builders/:userId/password': {
    path: f => `/api/orders/${f.orderA}/builders/${f.builderA2}/password`,
    expect: E(401, 200, 404, 404, 404, 404, 404),
  },
  'DELETE /api/orders/:id/builders/:userId': {
    path: f => `/api/orders/${f.orderA}/builders/${f.builderA2}`,
    expect: E(401, 204, 404, 404, 404, 404, 404),
  },
  'POST /api/orders/:id/cancel': {
    path: order('/cancel'),
    okPath: f => `/api/orders/${f.orderToCancel}/cancel`,
    body: () => ({ reason: 'Ordered twice.' }),
    expect: E(401, 200, 404, 403, 403, 403, 403),
  },
  'GET /api/orders/:id/documents/:kind': {
    path: order('/documents/invoice'),
    expect: E(401, 200, 404, 404, 404, 404, 200),
  },
  'GET /api/orders/:id/files/:fileId': {
    path: f => `/api/orders/${f.orderA}/files/${f.fileA}`,
    expect: E(401, 200, 404, 404, 404, 404, 200),
  },
  'POST /api/orders/:id/join-codes': {
    path: order('/join-codes'),
    body: () => ({ expiresInHours: 2, maxUses: 3 }),
    expect: E(401, 201, 404, 404, 404, 404, 404),
  },
  'POST /api/orders/:id/join-codes/:codeId/revoke': {
    path: f => `/api/orders/${f.orderA}/join-codes/${f.codeIdA}/revoke`,
    okPath: newJoinCode,
    expect: E(401, 200, 404, 404, 404, 404, 404),
  },

  'POST /api/planner/analyze': {
    path: p('/api/planner/analyze'),
    body: () => ({ rig, gains: sheetInputs().gains }),
    expect: all(200),
  },
  'POST /api/planner/plan': {
    path: p('/api/planner/plan'),
    body: () => ({ rig, targets: DEFAULT_TARGETS }),
    expect: all(200),
  },
  'GET /api/products': { path: p('/api/products'), expect: all(200) },
  'GET /api/products/:slug': { path: f => `/api/products/${f.productSlug}`, expect: all(200) },

  'GET /api/quotes': { path: p('/api/quotes'), expect: E(401, 200, 200, 403, 403, 403, 403) },
  'POST /api/quotes': {
    path: p('/api/quotes'),
    body: f => ({ lines: [{ productId: f.productId, quantity: 1 }] }),
    expect: E(401, 201, 201, 403, 403, 403, 403),
  },
  'GET /api/quotes/:id': {
    path: f => `/api/quotes/${f.quoteA}`,
    expect: E(401, 200, 404, 404, 404, 404, 200),
  },
  'GET /api/quotes/:id/pdf': {
    path: f => `/api/quotes/${f.quoteA}/pdf`,
    expect: E(401, 200, 404, 404, 404, 404, 200),
  },

  'GET /api/rigs/:id': {
    path: f => `/api/rigs/${f.rigA}`,
    expect: E(401, 200, 404, 200, 404, 200, 200),
  },
  'PATCH /api/rigs/:id': {
    path: f => `/api/rigs/${f.rigA}`,
    body: () => ({ groupLabel: 'Bench 3' }),
    expect: E(401, 200, 404, 404, 404, 404, 404),
  },
  'PUT /api/rigs/:id/calibration': {
    path: f => `/api/rigs/${f.rigA}/calibration`,
    body: () => ({
      adcBits: 10,
      pairs: [
        { reading: 100, position: -0.15 },
        { reading: 500, position: 0 },
        { reading: 900, position: 0.15 },
      ],
    }),
    expect: E(401, 200, 404, 200, 404, 404, 404),
  },
  'PUT /api/rigs/:id/dimensions': {
    path: f => `/api/rigs/${f.rigA}/dimensions`,
    body: () => ({ rig }),
    expect: E(401, 200, 404, 200, 404, 404, 404),
  },
  'PUT /api/rigs/:id/steps/:step': {
    path: f => `/api/rigs/${f.rigA}/steps/frame`,
    body: () => ({ done: true, note: 'Square and tight.' }),
    expect: E(401, 200, 404, 200, 404, 404, 404),
  },

  'GET /api/sheets': { path: p('/api/sheets'), expect: E(401, 200, 200, 200, 200, 403, 403) },
  'POST /api/sheets': {
    path: p('/api/sheets'),
    body: f => ({ title: 'Matrix', rigId: f.rigA, inputs: sheetInputs() }),
    expect: E(401, 201, 404, 201, 404, 403, 403),
  },
  'POST /api/sheets/import': {
    path: p('/api/sheets/import'),
    body: f => f.sheetFile,
    expect: E(401, 201, 201, 201, 201, 403, 403),
  },
  'GET /api/sheets/:id': {
    path: f => `/api/sheets/${f.sheetA}`,
    expect: E(401, 200, 404, 200, 404, 200, 200),
  },
  // The file of a sheet is for whoever may read the sheet (before it is archived below).
  'GET /api/sheets/:id/export': {
    path: f => `/api/sheets/${f.sheetA}/export`,
    expect: E(401, 200, 404, 200, 404, 200, 200),
  },
  'PATCH /api/sheets/:id': {
    path: f => `/api/sheets/${f.sheetA}`,
    body: () => ({ note: 'Settles in two seconds.' }),
    expect: E(401, 403, 404, 200, 404, 403, 403),
  },
  'DELETE /api/sheets/:id': {
    path: f => `/api/sheets/${f.sheetA}`,
    expect: E(401, 403, 404, [200, 204], 404, 403, 403),
  },

  'GET /api/staff/desk': {
    path: p('/api/staff/desk'),
    expect: E(401, 403, 403, 403, 403, 200, 200),
  },
  // The caught mail (with its links) is the admin's alone in fake mode.
  'GET /api/staff/mail': {
    path: p('/api/staff/mail'),
    expect: E(401, 403, 403, 403, 403, 403, 200),
  },

  'GET /api/stock-replies': {
    path: p('/api/stock-replies'),
    expect: E(401, 403, 403, 403, 403, 200, 200),
  },
  'POST /api/stock-replies': {
    path: p('/api/stock-replies'),
    body: () => ({ title: `Matrix ${unique()}`, body: 'Tighten the pushrod.' }),
    expect: E(401, 403, 403, 403, 403, 201, 201),
  },
  'PATCH /api/stock-replies/:id': {
    path: f => `/api/stock-replies/${f.stockReplyId}`,
    body: () => ({
      title: `Matrix reply ${unique()}`,
      body: 'Check the linkage first, then the servo horn.',
    }),
    expect: E(401, 403, 403, 403, 403, 200, 200),
  },
  'DELETE /api/stock-replies/:id': {
    path: f => `/api/stock-replies/${f.stockReplyId}`,
    okPath: newStockReply,
    expect: E(401, 403, 403, 403, 403, 204, 204),
  },

  'POST /api/ticket-attachments': {
    path: p('/api/ticket-attachments'),
    body: ticketFile,
    expect: E(401, 201, 201, 201, 201, 201, 201),
  },
  'GET /api/ticket-attachments/:id': {
    path: f => `/api/ticket-attachments/${f.attachmentA}`,
    expect: E(401, 200, 404, 200, 404, 200, 200),
  },
  // Sent files stay; a pending one is its uploader's alone to take back.
  'DELETE /api/ticket-attachments/:id': {
    path: f => `/api/ticket-attachments/${f.attachmentA}`,
    okPath: pendingUpload,
    expect: E(401, 404, 404, 204, 404, 404, 404),
  },

  'GET /api/tickets': { path: p('/api/tickets'), expect: E(401, 200, 200, 200, 200, 403, 403) },
  'POST /api/tickets': {
    path: p('/api/tickets'),
    body: f => ({ rigId: f.rigA, subject: 'Wobbles', message: 'The beam wobbles at rest.' }),
    expect: E(401, 201, 404, 201, 404, 403, 403),
  },
  'GET /api/tickets/counts': {
    path: p('/api/tickets/counts'),
    expect: E(401, 200, 200, 200, 200, 200, 200),
  },
  'GET /api/tickets/:id': {
    path: f => `/api/tickets/${f.ticketA}`,
    expect: E(401, 200, 404, 200, 404, 200, 200),
  },
  'PATCH /api/tickets/:id': {
    path: f => `/api/tickets/${f.ticketA}`,
    body: () => ({ status: 'resolved' }),
    expect: E(401, 200, 404, 200, 404, 200, 200),
  },
  'GET /api/tickets/:id/context': {
    path: f => `/api/tickets/${f.ticketA}/context`,
    expect: E(401, 404, 404, 404, 404, 200, 200),
  },
  'POST /api/tickets/:id/messages': {
    path: f => `/api/tickets/${f.ticketA}/messages`,
    body: () => ({ body: 'Any news on this?' }),
    expect: E(401, 201, 404, 201, 404, 201, 201),
  },
  'POST /api/tickets/:id/notes': {
    path: f => `/api/tickets/${f.ticketA}/notes`,
    body: () => ({ body: 'Probably the pushrod.' }),
    expect: E(401, 404, 404, 404, 404, 201, 201),
  },
  'POST /api/tickets/:id/replacements': {
    path: f => `/api/tickets/${f.ticketA}/replacements`,
    body: f => ({
      carrier: 'usps',
      tracking: 'PW-R-1',
      items: [{ productId: f.productId, quantity: 1 }],
    }),
    expect: E(401, 404, 404, 404, 404, 201, 201),
  },

  // Only the provider, with this install's signature: an unsigned event is refused for all.
  'POST /api/webhooks/payments': {
    path: p('/api/webhooks/payments'),
    body: () => ({ id: 'evt_matrix', type: 'checkout.session.completed', data: { object: {} } }),
    expect: all(400),
  },
}
