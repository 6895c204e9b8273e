// A second app process from the same build, on its own port and the same database: a
// restart, or a second instance behind a load balancer, as an operator would run one.
import { spawn, type ChildProcess } from 'node:child_process'
import { appendFileSync, readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { inject } from 'vitest'
import { projectRoot, startMariaDb } from '../../scripts/lib/mariadb'
import { SUFFIX, testDatabase } from '../setup/slot'

export interface AppInstance {
  url: string
  process: ChildProcess
  log: () => string
  kill: (signal?: NodeJS.Signals) => Promise<void>
}

function spawnApp(port: number, change: Record<string, string | undefined> = {}) {
  const url = `http://localhost:${port}`
  const env: Record<string, string> = {
    PATH: process.env.PATH ?? '',
    HOME: process.env.HOME ?? '/root',
    ...inject('appEnv'),
    PORT: String(port),
    NUXT_PUBLIC_URL: url,
  }
  for (const [k, v] of Object.entries(change)) {
    if (v === undefined) Reflect.deleteProperty(env, k)
    else env[k] = v
  }
  return {
    url,
    child: spawn(
      process.execPath,
      [resolve(projectRoot, `.output-test${SUFFIX}/server/index.mjs`)],
      {
        cwd: projectRoot,
        env,
        stdio: ['ignore', 'pipe', 'pipe'],
      },
    ),
  }
}

/** Starts the built app with the environment changed (undefined removes a variable) and
 *  waits for it to exit; gives its exit code and what it printed. */
export function runAppExpectingExit(port: number, change: Record<string, string | undefined>) {
  const { child } = spawnApp(port, change)
  let log = ''
  child.stdout!.on('data', (d) => {
    log += d
  })
  child.stderr!.on('data', (d) => {
    log += d
  })
  return new Promise<{ code: number | null, log: string }>((done) => {
    const t = setTimeout(() => {
      child.kill('SIGKILL')
    }, 20_000)
    child.once('exit', (code) => {
      clearTimeout(t)
      done({ code, log })
    })
  })
}

export async function startAppInstance(
  port: number,
  change: Record<string, string | undefined> = {},
): Promise<AppInstance> {
  const { url, child } = spawnApp(port, change)
  return awaitApp(url, child)
}

/** Starts a built app (`entry`, its server/index.mjs) with exactly this environment and waits
 *  until it answers; what it prints is also appended to `logFile` when one is named. */
export function launchApp(
  entry: string,
  env: Record<string, string>,
  logFile?: string,
): Promise<AppInstance> {
  const url = `http://localhost:${env.PORT}`
  const child = spawn(process.execPath, [entry], {
    cwd: projectRoot,
    env,
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  return awaitApp(url, child, logFile)
}

async function awaitApp(url: string, child: ChildProcess, logFile?: string) {
  let log = ''
  const keep = (d: Buffer) => {
    log += d
    if (logFile) appendFileSync(logFile, d)
  }
  child.stdout!.on('data', keep)
  child.stderr!.on('data', keep)
  const deadline = Date.now() + 30_000
  for (;;) {
    if (child.exitCode !== null) throw new Error(`the app instance at ${url} exited: ${log}`)
    try {
      if ((await fetch(`${url}/api/_auth/session`)).ok) break
    } catch {
      /* not up yet */
    }
    if (Date.now() > deadline) throw new Error(`the app instance at ${url} did not answer: ${log}`)
    await new Promise(r => setTimeout(r, 200))
  }
  return {
    url,
    process: child,
    log: () => log,
    kill: (signal: NodeJS.Signals = 'SIGKILL') =>
      new Promise<void>((done) => {
        if (child.exitCode !== null || child.signalCode !== null) return done()
        child.once('exit', () => done())
        child.kill(signal)
      }),
  }
}

/** Kills the test MariaDB at once (no clean shutdown), as a crash would. */
export function killDatabase() {
  const pid = Number(readFileSync(resolve(testDatabase().dataDir, 'mariadbd.pid'), 'utf8'))
  process.kill(pid, 'SIGKILL')
  return pid
}

export async function restartDatabase() {
  await startMariaDb(testDatabase())
}
