// `npm run test:cluster`: a three-node MariaDB Galera cluster on loopback
// (scripts/lib/galera.ts), migrated and seeded through the same scripts as the test database,
// the fake SMTP server, one production build, and two app instances: instance 1 on node 1,
// instance 2 on node 2. Ports 3720–3799 and 4700–4799, clear of every test slot.
import { mkdirSync, rmSync } from 'node:fs'
import { resolve } from 'node:path'
import type { TestProject } from 'vitest/node'
import { projectRoot } from '../../scripts/lib/mariadb'
import { galeraNodes, startGaleraCluster } from '../../scripts/lib/galera'
import { migrateDatabase } from '../../scripts/lib/migrate'
import { seedDemo } from '../../scripts/seed'
import { startMailCatcher } from '../../scripts/mail-catcher'
import { newSecrets } from '../../scripts/lib/secrets'
import { launchApp, type AppInstance } from '../helpers/instance'
import { buildApp, productionEnv, testAppEnv } from '../setup/global'

export const CLUSTER_APP_PORTS = [3731, 3732]
const SMTP_PORT = 3741
const MAIL_HTTP_PORT = 3742

declare module 'vitest' {
  export interface ProvidedContext {
    /** The instances' addresses, and each node's database address (node 1 first). */
    instanceUrls: string[]
    nodeUrls: string[]
    /** Where each instance's output is appended (the race counts its retries there). */
    instanceLogs: string[]
  }
}

export default async function setup(project: TestProject) {
  const started = Date.now()
  const folder = resolve(projectRoot, 'data', 'cluster')
  const nodes = galeraNodes()
  const cluster = await startGaleraCluster(nodes)
  const apps: AppInstance[] = []
  let catcher: Awaited<ReturnType<typeof startMailCatcher>> | null = null
  const stopAll = async () => {
    await Promise.all(apps.map(a => a.kill('SIGKILL')))
    await catcher?.close()
    cluster.stop()
  }
  try {
    const primary = nodes[0]!.db.url
    await migrateDatabase(primary)
    const uploadDir = resolve(projectRoot, 'data/uploads-cluster')
    await seedDemo(primary, uploadDir)
    catcher = await startMailCatcher({
      smtpPort: SMTP_PORT,
      httpPort: MAIL_HTTP_PORT,
      name: 'cluster',
      quiet: true,
    })
    await fetch(`http://127.0.0.1:${MAIL_HTTP_PORT}/messages`, { method: 'DELETE' })
    // TILTWRIGHT_CLUSTER_REUSE_BUILD=1 skips the build (the previous one must be current).
    if (process.env.TILTWRIGHT_CLUSTER_REUSE_BUILD !== '1')
      buildApp('.nuxt-cluster', '.output-cluster', uploadDir)
    const secrets = newSecrets()
    const entry = resolve(projectRoot, '.output-cluster/server/index.mjs')
    const logs = CLUSTER_APP_PORTS.map((_, i) => resolve(folder, `app${i + 1}.log`))
    mkdirSync(folder, { recursive: true })
    for (const [i, port] of CLUSTER_APP_PORTS.entries()) {
      rmSync(logs[i]!, { force: true })
      const env = testAppEnv({
        port,
        dbUrl: nodes[i]!.db.url,
        smtpPort: SMTP_PORT,
        mailHttpPort: MAIL_HTTP_PORT,
        secrets,
      })
      apps.push(await launchApp(entry, productionEnv(env), logs[i]))
    }
    // Both instances are the same deployment: the first one's address is the site's.
    project.provide('baseUrl', apps[0]!.url)
    project.provide('instanceUrls', apps.map(a => a.url))
    project.provide('nodeUrls', nodes.map(n => n.db.url))
    project.provide('instanceLogs', logs)
    project.provide('dbUrl', primary)
    project.provide('mailUrl', `http://127.0.0.1:${MAIL_HTTP_PORT}`)
    project.provide('paymentsKey', secrets.paymentsSecretKey)
    project.provide('webhookSecret', secrets.paymentsWebhookSecret)
    console.log(`[cluster] three nodes and two instances up in ${Date.now() - started} ms`)
  } catch (e) {
    await stopAll()
    throw e
  }
  return async () => {
    await stopAll()
    console.log(`[cluster] whole run took ${Math.round((Date.now() - started) / 1000)} s`)
  }
}
