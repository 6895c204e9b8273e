// Starts, once for the whole `server` project: a fresh test MariaDB (its own data folder
// and port, never the demo data), the fake SMTP server, and one production build of the
// app. Every API and browser test file talks to that one server.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process'
import { resolve } from 'node:path'
import type { TestProject } from 'vitest/node'
import { projectRoot, startMariaDb } from '../../scripts/lib/mariadb'
import { migrateDatabase } from '../../scripts/lib/migrate'
import { seedDemo } from '../../scripts/seed'
import { startMailCatcher } from '../../scripts/mail-catcher'
import { ensureDebianPackage } from '../../scripts/lib/system'
import { newSecrets, secretsEnv } from '../../scripts/lib/secrets'
import { APP_PORT, MAIL_HTTP_PORT, SMTP_PORT, SUFFIX, testDatabase } from './slot'

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string
    mailUrl: string
    dbUrl: string
    chromium: string
    appPid: number
    paymentsKey: string
    webhookSecret: string
    appEnv: Record<string, string>
  }
}

export default async function setup(project: TestProject) {
  const chromium = ensureDebianPackage(
    'chromium',
    'chromium',
    'the browser tests drive Debian\'s Chromium',
  )
  const db = await startMariaDb(testDatabase(), { fresh: true })
  await migrateDatabase(db.db.url)
  // The demo tickets' files go where the test build's `uploads` storage reads them.
  const uploadDir = resolve(projectRoot, `data/uploads-test${SUFFIX}`)
  await seedDemo(db.db.url, uploadDir)
  const catcher = await startMailCatcher({
    smtpPort: SMTP_PORT,
    httpPort: MAIL_HTTP_PORT,
    name: `test${SUFFIX}`,
    quiet: true,
  })
  await fetch(`http://127.0.0.1:${MAIL_HTTP_PORT}/messages`, { method: 'DELETE' })

  try {
    buildApp(`.nuxt-test${SUFFIX}`, `.output-test${SUFFIX}`, uploadDir)
  } catch (e) {
    await catcher.close()
    db.stop()
    throw e
  }

  const baseUrl = `http://localhost:${APP_PORT}`
  // This run's own secrets, as `npm start` makes per install; tests sign and call with them.
  const secrets = newSecrets()
  const appEnv = testAppEnv({
    port: APP_PORT,
    dbUrl: db.db.url,
    smtpPort: SMTP_PORT,
    mailHttpPort: MAIL_HTTP_PORT,
    secrets,
  })
  const app: ChildProcess = spawn(
    process.execPath,
    [resolve(projectRoot, `.output-test${SUFFIX}/server/index.mjs`)],
    {
      cwd: projectRoot,
      env: productionEnv(appEnv),
      stdio: ['ignore', 'pipe', 'pipe'],
    },
  )
  let log = ''
  app.stdout!.on('data', (d) => {
    log += d
  })
  app.stderr!.on('data', (d) => {
    log += d
  })
  const deadline = Date.now() + 60_000
  // A failed start must not leave the database, the mail catcher or the app running.
  const abandon = async (why: string) => {
    app.kill('SIGTERM')
    await catcher.close()
    db.stop()
    return new Error(why)
  }
  for (;;) {
    if (app.exitCode !== null) throw await abandon(`the app exited during start-up:\n${log}`)
    try {
      if ((await fetch(`${baseUrl}/api/_auth/session`)).ok) break
    } catch {
      /* not up yet */
    }
    if (Date.now() > deadline) throw await abandon(`the app did not answer within 60 s:\n${log}`)
    await new Promise(r => setTimeout(r, 250))
  }

  project.provide('baseUrl', baseUrl)
  project.provide('mailUrl', `http://127.0.0.1:${MAIL_HTTP_PORT}`)
  project.provide('dbUrl', db.db.url)
  project.provide('chromium', chromium)
  project.provide('appPid', app.pid!)
  project.provide('paymentsKey', secrets.paymentsSecretKey)
  project.provide('webhookSecret', secrets.paymentsWebhookSecret)
  project.provide('appEnv', appEnv)

  return async () => {
    app.kill('SIGTERM')
    await new Promise((r) => {
      const t = setTimeout(r, 5000)
      app.once('exit', () => {
        clearTimeout(t)
        r(null)
      })
    })
    if (process.env.TILTWRIGHT_TEST_LOG) console.log(`[tests] the app's log:\n${log}`)
    else if (/\[request error\]|\[unhandled\]/.test(log))
      console.warn(`[tests] the app logged errors during the run:\n${log.slice(-4000)}`)
    await catcher.close()
    db.stop()
  }
}

/** One production build of the app into folders of its own, its uploads on local disk here. */
export function buildApp(buildDir: string, outputDir: string, uploadDir: string) {
  const buildEnv = {
    ...process.env,
    TILTWRIGHT_BUILD_DIR: buildDir,
    TILTWRIGHT_OUTPUT_DIR: outputDir,
    TILTWRIGHT_UPLOAD_DIR: uploadDir,
  }
  const build = spawnSync(resolve(projectRoot, 'node_modules/.bin/nuxt'), ['build'], {
    cwd: projectRoot,
    env: buildEnv,
    encoding: 'utf8',
  })
  if (build.status !== 0) throw new Error(`nuxt build failed:\n${build.stdout}\n${build.stderr}`)
}

/** The environment of a test app instance: its port and database, the fake SMTP server, quick
 *  retries and sweeps, short job leases, and this run's secrets. */
export function testAppEnv(o: {
  port: number
  dbUrl: string
  smtpPort: number
  mailHttpPort: number
  secrets: ReturnType<typeof newSecrets>
}): Record<string, string> {
  return {
    PORT: String(o.port),
    HOST: '127.0.0.1',
    NODE_ENV: 'production',
    NUXT_DATABASE_URL: o.dbUrl,
    NUXT_SMTP_HOST: '127.0.0.1',
    NUXT_SMTP_PORT: String(o.smtpPort),
    NUXT_MAIL_CATCHER_URL: `http://127.0.0.1:${o.mailHttpPort}`,
    NUXT_PUBLIC_URL: `http://localhost:${o.port}`,
    // Retry failed jobs quickly, so the outage test need not wait 15 s.
    NUXT_OUTBOX_RETRY_BASE_MS: '400',
    // Sweep stale card orders every second, so the hold test need not wait 10 minutes.
    NUXT_CARD_HOLD_SWEEP_MS: '1000',
    // A killed app's job leases run out in 3 s, so the crash tests need not wait 30 s.
    NUXT_JOB_LEASE_MS: '3000',
    // Requests from 127.0.0.2 stand for a reverse proxy (the throttle test connects from there).
    NUXT_TRUSTED_PROXIES: '127.0.0.2',
    ...secretsEnv(o.secrets, true, {}),
  }
}

/** The app process's environment without vitest's variables: a production server, so that
 *  Nitro's scheduled tasks (the job runner) start as they do in production. */
export function productionEnv(appEnv: Record<string, string>) {
  const {
    VITEST: _v,
    VITEST_MODE: _vm,
    VITEST_POOL_ID: _vp,
    VITEST_WORKER_ID: _vw,
    TEST: _t,
    ...parentEnv
  } = process.env
  return { ...parentEnv, ...appEnv } as Record<string, string>
}
