// Generated JSON bodies for every write route (property-based, with fast-check): wrong types,
// huge, negative and not-quite-integer numbers, odd unicode (right-to-left marks, zero-width
// characters, emoji, escaped lone surrogates, NUL), arrays for objects, extra fields, valid
// bodies with one field replaced, and bodies nested 5000 levels deep. Each is sent by a caller
// who passes authentication and authorization for the route (the caller and the valid body come
// from the role matrix's table), so the body itself is what the server judges. Every answer must
// be below 500, a refusal the API's JSON error envelope, and a 422 must name its fields. The
// routes come from the route files, so a new write route is fuzzed the day it is added.
import fc from 'fast-check'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Client } from '../helpers/client'
import { apiRoutes, isWrite, type Route } from '../helpers/routes'
import {
  authorizedCaller,
  buildFixtures,
  freshClient,
  TABLE,
  type Fixtures,
} from './route-matrix.table'

// A fixed seed, printed so a failure can be replayed (FUZZ_SEED=… to try another, FUZZ_RUNS=…
// for more bodies per route).
const SEED = Number(process.env.FUZZ_SEED || 1313)
const RUNS = Number(process.env.FUZZ_RUNS || 30)
// Stand-ins replaced in the JSON text by what JSON can carry but JavaScript cannot produce.
const RAW: Record<string, string> = {
  '@@huge@@': '1e400',
  '@@tiny@@': '-1e400',
  '@@long@@': '123456789012345678901234567890',
}

const oddString = fc.oneof(
  fc.string({ unit: 'binary', maxLength: 30 }),
  fc.string({ unit: 'grapheme', maxLength: 30 }),
  fc.constantFrom(
    '',
    ' ',
    '\u202Eevil.png\u202C',
    'zero\u200Bwidth\u200D',
    '\u05E9\u05DC\u05D5\u05DD \u0645\u0631\u062D\u0628\u0627',
    '🧪🔩⚖️👩🏽‍🔬',
    'nul\u0000byte',
    'lone \uD800 surrogate',
    'other \uDFFF half',
    'x'.repeat(70_000),
    '%_\\',
    '\'; DROP TABLE users; --',
    '<script>alert(1)</script>',
    '../../etc/passwd',
    '2026-13-45',
    'NaN',
    'Infinity',
    '1e308',
    'null',
  ),
)
const oddNumber = fc.oneof(
  fc.constantFrom(1e308, -1e308, -1, 0, -0, 2 ** 53 + 1, -(2 ** 53 + 1), 0.5, 1e-308, 4294967296),
  fc.integer(),
  fc.double({ noNaN: true, noDefaultInfinity: true }),
  fc.constantFrom(...Object.keys(RAW)),
)
const leaf = fc.oneof(oddString, oddNumber, fc.boolean(), fc.constant(null))
const key = fc.oneof(fc.string({ maxLength: 12 }), fc.constantFrom('__proto__', 'constructor'))
const { value } = fc.letrec<{ value: unknown }>(tie => ({
  value: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    leaf,
    fc.array(tie('value'), { maxLength: 4 }),
    fc.dictionary(key, tie('value'), { maxKeys: 4 }),
  ),
}))

// Texts sent as they are: empty, bare JSON that is not an object, and broken JSON.
const NOT_JSON = ['', 'null', '[]', '"text"', '{', '{"a":1}{', '\u0000']

/** Every place in a valid body one value can be swapped for another (three levels deep). */
function pathsOf(v: unknown, depth = 0, at: (string | number)[] = []): (string | number)[][] {
  if (depth > 3 || v === null || typeof v !== 'object') return []
  return Object.keys(v).flatMap((k) => {
    const here = [...at, Array.isArray(v) ? Number(k) : k]
    return [here, ...pathsOf((v as any)[k], depth + 1, here)]
  })
}
function replaced(body: unknown, path: (string | number)[], v: unknown) {
  const copy = structuredClone(body) as any
  let node = copy
  for (const k of path.slice(0, -1)) node = node[k]
  node[path.at(-1)!] = v
  return copy
}

/** Bodies for a route whose valid body is `valid` (undefined or multipart: none to mutate). */
function bodies(valid: unknown) {
  const json = valid !== undefined && !(valid instanceof FormData) ? valid : null
  const shapes = [
    value,
    fc.array(value, { maxLength: 3 }),
    fc.constantFrom(...NOT_JSON),
  ]
  if (json && typeof json === 'object') {
    const paths = pathsOf(json)
    shapes.push(
      fc.constant(json),
      fc.constant([json]),
      fc.tuple(key, value).map(([k, v]) => ({ ...json, [k]: v })),
    )
    if (paths.length)
      shapes.push(fc.tuple(fc.constantFrom(...paths), value).map(([p, v]) => replaced(json, p, v)))
  }
  return fc.oneof(...shapes).map((b) => {
    if (typeof b === 'string' && NOT_JSON.includes(b)) return b
    let text = JSON.stringify(b) ?? 'null'
    for (const [stand, raw] of Object.entries(RAW)) text = text.replaceAll(`"${stand}"`, raw)
    return text
  })
}

const nested = (depth: number) => ({
  objects: '{"a":'.repeat(depth) + '1' + '}'.repeat(depth),
  arrays: '['.repeat(depth) + ']'.repeat(depth),
})

const send = (client: Client, method: string, path: string, text: string) =>
  client.request(method, path, text)

function judged(r: { status: number, body: any }, what: string) {
  tally.set(r.status, (tally.get(r.status) ?? 0) + 1)
  expect(r.status, `${what}: ${JSON.stringify(r.body).slice(0, 300)}`).toBeLessThan(500)
  if (r.status >= 400)
    expect(r.body, `${what}: the JSON error envelope`).toMatchObject({ statusCode: r.status })
  // A refused body says which fields are wrong (docs/api.md: 422 names each bad field).
  if (r.status === 422)
    expect(Object.keys(r.body.data?.fields ?? {}), `${what}: the fields in error`).not.toEqual([])
}

const writes = apiRoutes().filter(isWrite)
// Routes that archive or delete their resource go late, so the rest still find theirs; those
// that end sessions (a new password ends the caller's other sessions) go last.
const fresh = (r: Route) => TABLE[r.key]?.fresh === true
const ordered = [
  ...writes.filter(r => r.method !== 'DELETE' && !fresh(r)),
  ...writes.filter(r => r.method === 'DELETE' && !fresh(r)),
  ...writes.filter(fresh),
]
// How often each status came back, printed at the end (what the bodies reached).
const tally = new Map<number, number>()
let f: Fixtures

beforeAll(async () => {
  console.log(`fuzz-bodies: fast-check seed ${SEED}, ${RUNS} bodies per route`)
  f = await buildFixtures('fz')
}, 240_000)

afterAll(() => {
  const counts = [...tally].sort((a, b) => a[0] - b[0]).map(([s, n]) => `${s}: ${n}`)
  console.log(`fuzz-bodies: answers by status — ${counts.join(', ')}`)
})

describe('generated bodies for every write route', () => {
  it('knows a caller for every write route', () => {
    expect(writes.filter(r => !TABLE[r.key]).map(r => r.key)).toEqual([])
    expect(writes.length).toBeGreaterThan(40)
  })

  for (const route of ordered) {
    it(`${route.key} answers every body below 500`, async () => {
      const row = TABLE[route.key]!
      const caller = authorizedCaller(row)
      const path = await (row.okPath ?? row.path)(f, caller)
      const valid = row.body?.(f, caller)
      const method = route.method === 'ANY' ? 'POST' : route.method
      const clientFor = async () => (row.fresh ? freshClient(f, caller) : f.clients[caller])
      for (const [shape, text] of Object.entries(nested(5000)))
        judged(await send(await clientFor(), method, path, text), `${shape} nested 5000 deep`)
      await fc.assert(
        fc.asyncProperty(bodies(valid), async (text) => {
          const r = await send(await clientFor(), method, path, text)
          judged(r, `${route.key} as ${caller} with ${text.slice(0, 200)}`)
          if (r.status < 300 && row.undo) await row.undo(f, caller, JSON.parse(text))
        }),
        { seed: SEED, numRuns: RUNS, endOnFailure: true },
      )
    }, 120_000)
  }
})
