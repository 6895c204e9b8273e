// HTTP benchmark: `npm run bench:http` (and part of `npm run bench`). It asserts nothing: it
// prints figures and, beside each, whether it meets the goal of docs/benchmarks.md. Absolute
// rates on a shared machine are noise, so every rate is also given as a RATIO to two yardsticks
// measured in the same run: a bare h3 server and a static file of the app.
//
// It builds the app into .nuxt-bench/.output-bench (TILTWRIGHT_BENCH_REUSE=1 reuses an earlier
// build), starts its own MariaDB (bench slot 9 unless TILTWRIGHT_BENCH_SLOT says otherwise: the
// ports of tests/setup/slot.ts's scheme, data under data/mariadb-bench), migrates, seeds the demo
// data, starts the fake SMTP server and the app with NODE_ENV=production, and measures with
// autocannon on loopback: 20 connections, no cookies, 1 s of warm-up then 5 s per address.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process'
import { existsSync } from 'node:fs'
import { resolve } from 'node:path'
import autocannon from 'autocannon'
import mysql from 'mysql2/promise'
import { instance, projectRoot, startMariaDb } from '../scripts/lib/mariadb'
import { migrateDatabase } from '../scripts/lib/migrate'
import { DEMO_PASSWORD, seedDemo } from '../scripts/seed'
import { startMailCatcher } from '../scripts/mail-catcher'
import { newSecrets, secretsEnv } from '../scripts/lib/secrets'

const SLOT = Number(process.env.TILTWRIGHT_BENCH_SLOT || 9)
const APP_PORT = 3417 + SLOT * 100
const SMTP_PORT = 2525 + SLOT * 100
const MAIL_HTTP_PORT = 2580 + SLOT * 100
const DB_PORT = 3407 + SLOT * 100
const BARE_PORT = 3418 + SLOT * 100
const CONNECTIONS = 20
const SECONDS = Number(process.env.TILTWRIGHT_BENCH_SECONDS || 5)
const base = `http://127.0.0.1:${APP_PORT}`
const children: ChildProcess[] = []
const stops: (() => unknown)[] = []

function log(line: string) {
  console.log(`[bench:http] ${line}`)
}

async function waitFor(url: string, child: ChildProcess, output: () => string) {
  const deadline = Date.now() + 90_000
  for (;;) {
    if (child.exitCode !== null) throw new Error(`${url}: the server exited:\n${output()}`)
    try {
      await fetch(url)
      return
    } catch {
      /* not up yet */
    }
    if (Date.now() > deadline) throw new Error(`${url} did not answer in 90 s:\n${output()}`)
    await new Promise(r => setTimeout(r, 250))
  }
}

function startChild(args: string[], env: Record<string, string>) {
  const child = spawn(process.execPath, args, {
    cwd: projectRoot,
    env: { ...process.env, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  let out = ''
  child.stdout!.on('data', d => (out = (out + d).slice(-8000)))
  child.stderr!.on('data', d => (out = (out + d).slice(-8000)))
  children.push(child)
  return { child, output: () => out }
}

// The yardstick: h3 (the HTTP layer under Nitro) answering a small JSON object, nothing else.
const BARE_H3 = `
import { createServer } from 'node:http'
import { createApp, eventHandler, toNodeListener } from 'h3'
const app = createApp()
app.use('/', eventHandler(() => ({ ok: true, name: 'yardstick' })))
createServer(toNodeListener(app)).listen(${BARE_PORT}, '127.0.0.1')
`

interface Rate {
  rps: number
  non2xx: number
  errors: number
}

async function rate(path: string, url = base + path): Promise<Rate> {
  const run = (duration: number) =>
    autocannon({ url, connections: CONNECTIONS, duration, pipelining: 1 })
  await run(1)
  const r = await run(SECONDS)
  return { rps: r.requests.average, non2xx: r.non2xx, errors: r.errors + r.timeouts }
}

/** A tiny cookie-keeping client for the signed-in parts (checkout, the help queue). */
class Caller {
  cookies = new Map<string, string>()
  csrf = ''
  async fetch(path: string, init: RequestInit = {}) {
    const headers = new Headers(init.headers)
    if (init.method && init.method !== 'GET') {
      if (!this.csrf) await this.token()
      headers.set('csrf-token', this.csrf)
      headers.set('content-type', 'application/json')
    }
    if (this.cookies.size)
      headers.set('cookie', [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; '))
    const res = await fetch(base + path, { ...init, headers, redirect: 'manual' })
    for (const c of res.headers.getSetCookie()) {
      const pair = c.split(';')[0]!
      const i = pair.indexOf('=')
      this.cookies.set(pair.slice(0, i), pair.slice(i + 1))
    }
    return res
  }

  async token() {
    const r = await this.fetch('/api/csrf-token')
    if (r.ok) this.csrf = ((await r.json()) as { token: string }).token
    else {
      const html = await (await this.fetch('/')).text()
      this.csrf = html.match(/<meta name="csrf-token" content="([^"]+)"/)?.[1] ?? ''
    }
  }

  async signIn(email: string, password: string) {
    const r = await this.fetch('/api/auth/login', {
      method: 'POST',
      body: JSON.stringify({ email, password }),
    })
    if (r.status !== 200) throw new Error(`sign-in of ${email}: ${r.status} ${await r.text()}`)
  }
}

const quantile = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b)
  return s[Math.min(s.length - 1, Math.floor(q * s.length))] ?? NaN
}

/** 20 teachers of 20 schools at once, each placing card checkouts one after another. A school
 *  may hold only maxUnpaidCardOrders (3) unpaid card orders, so each buyer places 3. */
async function checkoutRun(db: mysql.Connection) {
  const buyers = CONNECTIONS
  const perBuyer = 3
  const [[hash]] = (await db.query(
    'select password_hash as h from users where email = \'teacher@tiltwright.test\'',
  )) as unknown as [{ h: string }[]]
  const [[product]] = (await db.query(
    'select id from products where active = true and kind = \'part\' order by id limit 1',
  )) as unknown as [{ id: number }[]]
  // Stock for every checkout, in a batch of the bench's own.
  await db.query(
    'insert into batches (product_id, code, quantity_built, built_on) values (?, ?, ?, now(3))',
    [product!.id, 'BENCH-1', 100_000],
  )
  const emails: string[] = []
  for (let i = 0; i < buyers; i++) {
    const [school] = (await db.query(
      'insert into schools (name, address_line1, city, region, postal_code) '
      + 'values (?, \'1 Bench Lane\', \'Ridgeford\', \'CA\', \'95999\')',
      [`Bench Academy ${i + 1}`],
    )) as unknown as [{ insertId: number }]
    const email = `bench-teacher-${i + 1}@school.test`
    await db.query(
      'insert into users (email, name, password_hash, role, school_id, verified_at) '
      + 'values (?, ?, ?, \'teacher\', ?, now(3))',
      [email, `Bench Teacher ${i + 1}`, hash!.h, school.insertId],
    )
    emails.push(email)
  }
  const callers = await Promise.all(
    emails.map(async (e) => {
      const c = new Caller()
      await c.signIn(e, DEMO_PASSWORD)
      return c
    }),
  )
  const times: number[] = []
  let errors = 0
  await Promise.all(
    callers.map(async (c) => {
      for (let k = 0; k < perBuyer; k++) {
        const t0 = performance.now()
        const r = await c.fetch('/api/checkout/card', {
          method: 'POST',
          body: JSON.stringify({ lines: [{ productId: product!.id, quantity: 1 }] }),
        })
        const text = await r.text()
        times.push(performance.now() - t0)
        if (r.status !== 201 && ++errors <= 3)
          log(`checkout failed: ${r.status} ${text.slice(0, 200)}`)
      }
    }),
  )
  return { count: times.length, p50: quantile(times, 0.5), p95: quantile(times, 0.95), errors }
}

const QUEUE_PAGES = [
  '/api/help-queue?status=needs+reply&sort=lastMessageAt&dir=desc&pageSize=25',
  '/api/help-queue?status=open&priority=urgent&sort=createdAt&dir=asc&pageSize=25',
  '/api/help-queue?assignee=none&sort=priority&dir=desc&pageSize=25',
]

/** Median time of each queue page over `n` sequential requests, ms. */
async function queueTimes(support: Caller, n = 15) {
  const out: number[] = []
  for (const path of QUEUE_PAGES) {
    const times: number[] = []
    for (let i = 0; i < n; i++) {
      const t0 = performance.now()
      const r = await support.fetch(path)
      await r.arrayBuffer()
      if (r.status !== 200) throw new Error(`${path}: ${r.status}`)
      times.push(performance.now() - t0)
    }
    out.push(quantile(times, 0.5))
  }
  return out
}

/** Bulk tickets of invented data on the demo order, up to `total` in the table. */
async function fillTickets(db: mysql.Connection, total: number) {
  const [[have]] = (await db.query('select count(*) as n from tickets')) as unknown as [
    { n: number }[],
  ]
  const missing = total - Number(have!.n)
  if (missing <= 0) return
  const [[o]] = (await db.query(
    'select o.id, o.school_id as s, u.id as u from orders o '
    + 'join users u on u.school_id = o.school_id and u.role = \'teacher\' order by o.id limit 1',
  )) as unknown as [{ id: number, s: number, u: number }[]]
  // MariaDB's Sequence engine (seq_1_to_N) makes the rows in one statement.
  await db.query(
    `insert into tickets (school_id, order_id, opened_by_id, subject, status, priority,
       created_at, last_message_at, status_changed_at)
     select ?, ?, ?, concat('Bench ticket ', seq),
       elt(1 + seq % 3, 'needs reply', 'awaiting builder', 'resolved'),
       elt(1 + seq % 7 % 3, 'low', 'normal', 'urgent'),
       now(3) - interval (seq % 90000) minute, now(3) - interval (seq % 7000) minute,
       now(3) - interval (seq % 5000) minute
     from seq_1_to_${missing}`,
    [o!.s, o!.id, o!.u],
  )
}

function ratioLine(name: string, r: Rate, bare: number, file: number, goal?: string) {
  const toBare = (100 * r.rps) / bare
  const toFile = (100 * r.rps) / file
  const oddities = r.non2xx || r.errors ? `  (${r.non2xx} non-2xx, ${r.errors} errors)` : ''
  return `${name.padEnd(30)} ${r.rps.toFixed(0).padStart(7)} req/s  ${toBare
    .toFixed(1)
    .padStart(6)} % of h3  ${toFile.toFixed(0).padStart(5)} % of file  ${goal ?? ''}${oddities}`
}

async function main() {
  const buildDir = '.nuxt-bench'
  const outputDir = '.output-bench'
  const uploadDir = resolve(projectRoot, 'data/uploads-bench')
  if (!(process.env.TILTWRIGHT_BENCH_REUSE && existsSync(resolve(projectRoot, outputDir)))) {
    log('building the app…')
    const b = spawnSync(resolve(projectRoot, 'node_modules/.bin/nuxt'), ['build'], {
      cwd: projectRoot,
      env: {
        ...process.env,
        TILTWRIGHT_BUILD_DIR: buildDir,
        TILTWRIGHT_OUTPUT_DIR: outputDir,
        TILTWRIGHT_UPLOAD_DIR: uploadDir,
      },
      encoding: 'utf8',
    })
    if (b.status !== 0) throw new Error(`nuxt build failed:\n${b.stdout}\n${b.stderr}`)
    const budget = b.stdout.split('\n').filter(l => /first-load JS/.test(l))
    if (budget.length) console.log(budget.join('\n'))
  }
  const started = await startMariaDb(instance('bench', DB_PORT, 'tiltwright_bench'), {
    fresh: true,
  })
  stops.push(() => started.stop())
  await migrateDatabase(started.db.url)
  await seedDemo(started.db.url, uploadDir)
  const catcher = await startMailCatcher({
    smtpPort: SMTP_PORT,
    httpPort: MAIL_HTTP_PORT,
    name: 'bench',
    quiet: true,
  })
  stops.push(() => catcher.close())
  // TILTWRIGHT_BENCH_NODE_ARGS='--cpu-prof --cpu-prof-dir=data/profiles' profiles the app.
  const nodeArgs = (process.env.TILTWRIGHT_BENCH_NODE_ARGS ?? '').split(' ').filter(Boolean)
  const app = startChild([...nodeArgs, resolve(projectRoot, outputDir, 'server/index.mjs')], {
    PORT: String(APP_PORT),
    HOST: '127.0.0.1',
    NODE_ENV: 'production',
    NUXT_DATABASE_URL: started.db.url,
    NUXT_SMTP_HOST: '127.0.0.1',
    NUXT_SMTP_PORT: String(SMTP_PORT),
    NUXT_MAIL_CATCHER_URL: `http://127.0.0.1:${MAIL_HTTP_PORT}`,
    NUXT_PUBLIC_URL: base,
    ...secretsEnv(newSecrets(), true, {}),
  })
  const bare = startChild(['--input-type=module', '-e', BARE_H3], {})
  await waitFor(`${base}/api/_auth/session`, app.child, app.output)
  await waitFor(`http://127.0.0.1:${BARE_PORT}/`, bare.child, bare.output)

  const db = await mysql.createConnection({ uri: started.db.url })
  stops.push(() => db.end())
  const [[kit]] = (await db.query(
    'select slug from products where active = true and kind = \'kit\' order by sort_order limit 1',
  )) as unknown as [{ slug: string }[]]
  const asset = (await (await fetch(`${base}/`)).text()).match(/\/_nuxt\/[\w.-]+\.js/)?.[0]

  log(`${CONNECTIONS} connections, no cookies, 1 s warm-up then ${SECONDS} s each`)
  const h3 = await rate('', `http://127.0.0.1:${BARE_PORT}/`)
  const file = await rate('/favicon.svg')
  const lines = [
    ratioLine('bare h3 (yardstick)', h3, h3.rps, file.rps),
    ratioLine('static file /favicon.svg', file, h3.rps, file.rps),
  ]
  if (asset) {
    const r = await rate(asset)
    lines.push(ratioLine(`static ${asset.slice(0, 22)}`, r, h3.rps, file.rps))
  }
  const verdict = (ok: boolean, goal: string) => `${ok ? 'PASS' : 'FAIL'} (goal ${goal})`
  const api: [string, string][] = [
    ['GET /api/products', '/api/products'],
    [`GET /api/products/${kit!.slug}`.slice(0, 30), `/api/products/${kit!.slug}`],
  ]
  for (const [name, path] of api) {
    const r = await rate(path)
    lines.push(ratioLine(name, r, h3.rps, file.rps, verdict(r.rps >= 0.2 * h3.rps, '≥ 20 % h3')))
  }
  lines.push(ratioLine('GET /api/_auth/session (empty)', await rate('/api/_auth/session'),
    h3.rps, file.rps))
  const pages: [string, string][] = [
    ['home /', '/'],
    ['kits /kits', '/kits'],
    [`kit /kits/${kit!.slug}`.slice(0, 30), `/kits/${kit!.slug}`],
    ['guide /help', '/help'],
  ]
  for (const [name, path] of pages) {
    const r = await rate(path)
    const ok = verdict(r.rps >= 0.3 * file.rps, '≥ 30 % file')
    lines.push(ratioLine(name, r, h3.rps, file.rps, ok))
  }
  const planner = await rate('/planner')
  lines.push(ratioLine('planner /planner', planner, h3.rps, file.rps))
  const unknown = await rate('/no-such-page/here')
  lines.push(ratioLine('unknown URL (404)', unknown, h3.rps, file.rps,
    verdict(unknown.rps >= file.rps * 0.9, '≈ static file')))
  console.log(lines.join('\n'))

  log('checkout: 20 teachers of 20 schools at once, 3 card checkouts each…')
  const co = await checkoutRun(db)
  console.log(
    `checkout (${co.count} card orders)      p50 ${co.p50.toFixed(0)} ms  p95 ${co.p95.toFixed(
      0,
    )} ms  ${co.errors} errors  ${verdict(co.p95 < 150 && !co.errors, 'p95 < 150 ms, none')}`,
  )

  log('help queue: 500 tickets, then 50 000…')
  const support = new Caller()
  await support.signIn('support@tiltwright.test', DEMO_PASSWORD)
  await fillTickets(db, 500)
  const small = await queueTimes(support)
  await fillTickets(db, 50_000)
  await db.query('analyze table tickets')
  const large = await queueTimes(support)
  QUEUE_PAGES.forEach((p, i) => {
    const x = large[i]! / small[i]!
    console.log(
      `${p.slice(16).padEnd(64)} 500: ${small[i]!.toFixed(1)} ms  50 000: ${large[i]!.toFixed(
        1,
      )} ms  ×${x.toFixed(1)}  ${verdict(x < 2, '< ×2')}`,
    )
  })
}

async function stopAll() {
  for (const c of children) if (c.exitCode === null) c.kill('SIGTERM')
  for (const s of stops.reverse()) await s()
}

main()
  .then(stopAll)
  .catch(async (e) => {
    console.error(e)
    await stopAll()
    process.exitCode = 1
  })
