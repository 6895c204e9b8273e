// Every API route, called as each of seven callers: anonymous, the teacher of school A and of
// school B, a builder of A's build space and of B's, support and admin. The routes come from
// the route files (tests/helpers/routes.ts), so a route without a row fails here; the answers
// come from tests/api/route-matrix.table.ts (docs/api.md, who may call what). Paths point at
// school A's resources, so B's teacher and B's builder must meet 404 on each, reads and writes,
// and A's resources read the same afterwards.
import { beforeAll, describe, expect, it } from 'vitest'
import { apiRoutes } from '../helpers/routes'
import {
  buildFixtures,
  CALLERS,
  freshClient,
  okSet,
  refused,
  TABLE,
  type Caller,
  type Expected,
  type Fixtures,
  type Row,
} from './route-matrix.table'

interface Miss {
  key: string
  caller: Caller
  path: string
  want: Expected
  got: number
  body: string
}

async function call(f: Fixtures, key: string, row: Row, caller: Caller, misses: Miss[]) {
  // A file without a method suffix (`ANY`) answers every method: it is called with POST.
  const method = key.startsWith('ANY ') ? 'POST' : key.split(' ')[0]!
  const want = row.expect[caller]
  const path = await (!refused(want) && row.okPath ? row.okPath : row.path)(f, caller)
  const client = row.fresh ? await freshClient(f, caller) : f.clients[caller]
  const body = row.body?.(f, caller) ?? (method === 'GET' ? undefined : {})
  const r = await client.request(method, path, body)
  if (!okSet(want).includes(r.status)) {
    const text = typeof r.body === 'string' ? r.body.slice(0, 120) : JSON.stringify(r.body)
    misses.push({ key, caller, path, want, got: r.status, body: text?.slice(0, 200) ?? '' })
  } else if (r.status >= 400 && r.status < 500) {
    // A refusal is the API's error envelope, not a page or an empty answer.
    expect(r.body, `${key} as ${caller}`).toMatchObject({ statusCode: r.status })
  }
  if (r.status < 300 && row.undo) await row.undo(f, caller, body)
  return r
}

/** What school A's people see of A's resources, minus the clocks that move on their own. */
async function snapshotOfA(f: Fixtures) {
  const { teacherA, builderA } = f.clients
  const reads = {
    order: await teacherA.get(`/api/orders/${f.orderA}`),
    board: await teacherA.get(`/api/orders/${f.orderA}/board`),
    quote: await teacherA.get(`/api/quotes/${f.quoteA}`),
    rig: await teacherA.get(`/api/rigs/${f.rigA}`),
    sheet: await builderA.get(`/api/sheets/${f.sheetA}`),
    ticket: await teacherA.get(`/api/tickets/${f.ticketA}`),
    attachment: await builderA.raw(`/api/ticket-attachments/${f.attachmentA}`),
    account: await teacherA.get('/api/account'),
  }
  const out: Record<string, unknown> = {}
  for (const [name, r] of Object.entries(reads)) {
    expect(r.status, name).toBe(200)
    out[name] = r instanceof Response
      ? Buffer.from(await r.arrayBuffer()).toString('base64')
      : JSON.parse(JSON.stringify(r.body, (k, v) => (k === 'updatedAt' ? undefined : v)))
  }
  return out
}

const routes = apiRoutes()
let f: Fixtures

beforeAll(async () => {
  f = await buildFixtures('mx')
}, 240_000)

describe('the role × route matrix', () => {
  it('has one row for every route file, and no row without one', () => {
    const served = routes.map(r => r.key)
    expect(served.filter(k => !TABLE[k]), 'routes without a row').toEqual([])
    expect(Object.keys(TABLE).filter(k => !served.includes(k)), 'rows without a route')
      .toEqual([])
  })

  it('refuses every caller who may not call a route, and A\'s resources stay as they were',
    async () => {
      const before = await snapshotOfA(f)
      const misses: Miss[] = []
      let calls = 0
      for (const [key, row] of Object.entries(TABLE)) {
        for (const caller of CALLERS) {
          if (!refused(row.expect[caller])) continue
          await call(f, key, row, caller, misses)
          calls++
        }
      }
      console.log(`refusals: ${calls} calls`)
      expect(misses).toEqual([])
      expect(await snapshotOfA(f)).toEqual(before)
    }, 300_000)

  it('lets every caller who may call a route through to the route\'s own answer', async () => {
    const misses: Miss[] = []
    let calls = 0
    const rows = Object.entries(TABLE)
    // Calls that end or replace a session run last, each with a session of its own.
    for (const [key, row] of [...rows.filter(r => !r[1].fresh), ...rows.filter(r => r[1].fresh)]) {
      for (const caller of CALLERS) {
        if (refused(row.expect[caller])) continue
        await call(f, key, row, caller, misses)
        calls++
      }
    }
    console.log(`successes: ${calls} calls`)
    expect(misses).toEqual([])
  }, 300_000)
})
