// `npm start` (built app), `npm run dev` (Nuxt dev server) and `npm run db:start`:
// make sure the private MariaDB is there and migrated, seed the demo data when the
// database is empty, start the fake SMTP server, then the app. Ctrl-C or SIGTERM stops
// everything this script started, the database included.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process'
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { createConnection } from 'node:net'
import {
  instance,
  ping,
  projectRoot,
  startMariaDb,
  type DbInstance,
  type Started,
} from './lib/mariadb'
import { migrateDatabase } from './lib/migrate'
import { seedDemo } from './seed'
import { startMailCatcher, type Catcher } from './mail-catcher'
import { installSecrets, secretsEnv } from './lib/secrets'

const dev = process.argv.includes('--dev')
const dbOnly = process.argv.includes('--db-only')
const port = Number(process.env.PORT || 3000)
const smtpPort = Number(process.env.TILTWRIGHT_SMTP_PORT || 1025)
const mailHttpPort = Number(process.env.TILTWRIGHT_MAIL_HTTP_PORT || 1080)
const dbPort = Number(process.env.TILTWRIGHT_DB_PORT || 3406)

function portInUse(p: number) {
  return new Promise<boolean>((ok) => {
    const s = createConnection({ host: '127.0.0.1', port: p })
    s.once('connect', () => {
      s.destroy()
      ok(true)
    })
    s.once('error', () => ok(false))
  })
}

// One `npm start` / `npm run dev` per checkout: a second one says so and leaves the first alone.
const pidFile = resolve(projectRoot, 'data', 'tiltwright.pid')
let ownsPidFile = false
function claimPidFile() {
  if (existsSync(pidFile)) {
    const other = Number(readFileSync(pidFile, 'utf8'))
    let alive = false
    try {
      if (other && other !== process.pid) {
        process.kill(other, 0)
        alive = true
      }
    } catch {
      /* gone */
    }
    if (alive) {
      console.error(
        `[tiltwright] Tiltwright is already running from this folder (process ${other}); `
        + `nothing to do. Stop it with Ctrl-C first.`,
      )
      process.exit(1)
    }
  }
  writeFileSync(pidFile, String(process.pid))
  ownsPidFile = true
}

let db: Started | undefined
let catcher: Catcher | undefined
let app: ChildProcess | undefined
let stopping = false

async function stop(code = 0) {
  if (stopping) return
  stopping = true
  console.log('\n[tiltwright] stopping…')
  if (app && app.exitCode === null) {
    app.kill('SIGTERM')
    await new Promise((r) => {
      const t = setTimeout(r, 8000)
      app!.once('exit', () => {
        clearTimeout(t)
        r(null)
      })
    })
  }
  await catcher?.close()
  if (db?.startedHere) {
    db.stop()
    console.log('[tiltwright] database stopped')
  }
  if (ownsPidFile) rmSync(pidFile, { force: true })
  process.exit(code)
}
process.on('SIGINT', () => void stop(0))
process.on('SIGTERM', () => void stop(0))
process.on('SIGHUP', () => void stop(0))
// npm does not pass a SIGTERM it receives on to this script: if whoever started us goes away,
// we are orphaned (a new parent id) and stop everything ourselves.
const parentAtStart = process.ppid
setInterval(() => {
  if (process.ppid !== parentAtStart) void stop(0)
}, 1000).unref()

// The private MariaDB this script started is watched: two missed pings in a row (5 s apart)
// and it is started again on the same data, and the log says so. Meanwhile the app answers 503.
function watchDatabase(target: DbInstance) {
  let missed = 0
  let restarting = false
  setInterval(async () => {
    if (stopping || restarting) return
    if (ping(target)) {
      missed = 0
      return
    }
    if (++missed < 2) return
    restarting = true
    console.log('[tiltwright] the database stopped answering; restarting it…')
    try {
      db = await startMariaDb(target)
      missed = 0
      console.log(`[tiltwright] database restarted on 127.0.0.1:${target.port}`)
    } catch (e) {
      console.error(
        `[tiltwright] could not restart the database (${e instanceof Error ? e.message : e}); `
        + `trying again shortly`,
      )
    } finally {
      restarting = false
    }
  }, 5000).unref()
}

async function main() {
  mkdirSync(resolve(projectRoot, 'data'), { recursive: true })
  claimPidFile()
  if (!dbOnly && (await portInUse(port))) {
    console.error(
      `[tiltwright] port ${port} is already in use: is Tiltwright already running? Stop it `
      + `first, or start this one with PORT=<another port>.`,
    )
    process.exit(1)
  }
  const target = instance('dev', dbPort, 'tiltwright')
  db = await startMariaDb(target)
  console.log(
    `[tiltwright] MariaDB ${db.startedHere ? 'started' : 'already running'} on `
    + `127.0.0.1:${dbPort} (data in data/mariadb-dev)`,
  )
  if (db.startedHere) watchDatabase(target)
  await migrateDatabase(target.url)
  console.log('[tiltwright] migrations applied')
  const seeded = await seedDemo(target.url)
  if (seeded.people)
    console.log(
      '[tiltwright] demo school and accounts seeded (password for every demo account: '
      + 'tiltwright-demo)',
    )
  if (seeded.catalog) console.log('[tiltwright] demo catalog seeded')
  if (dbOnly) {
    console.log(
      `[tiltwright] database ready at ${target.url.replace(/:[^:@]*@/, ':***@')}; Ctrl-C stops it`,
    )
    setInterval(() => {}, 1 << 30)
    return
  }
  if (await portInUse(smtpPort))
    console.log(
      `[tiltwright] something already listens on ${smtpPort}; using it as the SMTP server`,
    )
  else {
    catcher = await startMailCatcher({ smtpPort, httpPort: mailHttpPort, name: 'dev' })
    console.log(
      `[tiltwright] fake SMTP on 127.0.0.1:${smtpPort}; caught mail at `
      + `http://127.0.0.1:${mailHttpPort}/`,
    )
  }
  const env = {
    ...process.env,
    PORT: String(port),
    NUXT_DATABASE_URL: target.url,
    NUXT_SMTP_HOST: '127.0.0.1',
    NUXT_SMTP_PORT: String(smtpPort),
    NUXT_MAIL_CATCHER_URL: `http://127.0.0.1:${mailHttpPort}`,
    NUXT_PUBLIC_URL: process.env.NUXT_PUBLIC_URL || `http://localhost:${port}`,
    // Per-install secrets (data/secrets.json, made on first start); the environment wins.
    ...secretsEnv(
      installSecrets(resolve(projectRoot, 'data', 'secrets.json')),
      process.env.TILTWRIGHT_FAKE_PAYMENTS !== '0',
    ),
    // A Secure session cookie only where the app is served over HTTPS.
    NUXT_SESSION_COOKIE_SECURE: String((process.env.NUXT_PUBLIC_URL ?? '').startsWith('https://')),
  }
  const nuxt = resolve(projectRoot, 'node_modules/.bin/nuxt')
  if (dev) {
    app = spawn(nuxt, ['dev', '--port', String(port)], { stdio: 'inherit', env, cwd: projectRoot })
  } else {
    console.log('[tiltwright] building the app (about 30 s)…')
    const build = spawnSync(nuxt, ['build'], { stdio: 'inherit', env, cwd: projectRoot })
    if (build.status !== 0) throw new Error('nuxt build failed')
    app = spawn(process.execPath, ['.output/server/index.mjs'], {
      stdio: 'inherit',
      env,
      cwd: projectRoot,
    })
    console.log(
      `[tiltwright] Tiltwright is at http://localhost:${port} — sign in as `
      + `teacher@tiltwright.test (or builder@, support@, admin@) with tiltwright-demo`,
    )
  }
  app.once('exit', (code) => {
    if (!stopping) {
      console.log(`[tiltwright] the app exited (${code})`)
      void stop(code ?? 1)
    }
  })
}

main().catch((e) => {
  console.error(`[tiltwright] ${e instanceof Error ? e.message : e}`)
  void stop(1)
})
