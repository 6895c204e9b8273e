// A three-node MariaDB Galera cluster on loopback, for `npm run test:cluster`: each node is the
// private MariaDB of scripts/lib/mariadb.ts (its own data folder under data/cluster/, its own
// port and socket) started with Debian's Galera provider (package galera-4; rsync copies the
// data to a joining node). Node 1 bootstraps the cluster, the others join it.
import { spawnSync } from 'node:child_process'
import { chownSync, mkdirSync, readFileSync, rmSync } from 'node:fs'
import { resolve } from 'node:path'
import {
  instance,
  ping,
  projectRoot,
  rootSql,
  shutdown,
  startMariaDb,
  type DbInstance,
} from './mariadb'
import { ensureDebianPackage } from './system'

const PROVIDER = '/usr/lib/galera/libgalera_smm.so'

export interface GaleraNode {
  index: number
  db: DbInstance
  /** Group communication (gcomm), incremental state transfer and full state transfer ports. */
  gcommPort: number
  istPort: number
  sstPort: number
}

/** Ports: SQL 3720+N, Galera 4700+10N+{1,2,3}; clear of every test slot's ports. */
export function galeraNodes(count = 3, database = 'tiltwright_cluster'): GaleraNode[] {
  const folder = resolve(projectRoot, 'data', 'cluster')
  return Array.from({ length: count }, (_, i) => {
    const n = i + 1
    return {
      index: n,
      db: instance(`node${n}`, 3720 + n, database, folder),
      gcommPort: 4700 + 10 * n + 1,
      istPort: 4700 + 10 * n + 2,
      sstPort: 4700 + 10 * n + 3,
    }
  })
}

function ensureGalera() {
  ensureDebianPackage('rsync', 'rsync', 'a joining Galera node receives its data by rsync')
  // galera-4 ships a library, not a command: its path stands for the package.
  ensureDebianPackage(PROVIDER, 'galera-4', 'the cluster test runs a MariaDB Galera cluster')
}

function nodeArgs(node: GaleraNode, all: GaleraNode[], bootstrap: boolean): string[] {
  const members = all.map(n => `127.0.0.1:${n.gcommPort}`).join(',')
  return [
    '--wsrep-on=ON',
    `--wsrep-provider=${PROVIDER}`,
    '--wsrep-cluster-name=tiltwright-cluster-test',
    `--wsrep-cluster-address=gcomm://${members}`,
    `--wsrep-node-name=node${node.index}`,
    `--wsrep-node-address=127.0.0.1:${node.gcommPort}`,
    '--wsrep-provider-options='
    + `gmcast.listen_addr=tcp://127.0.0.1:${node.gcommPort};`
    + `ist.recv_addr=127.0.0.1:${node.istPort};gcache.size=64M`,
    '--wsrep-sst-method=rsync',
    `--wsrep-sst-receive-address=127.0.0.1:${node.sstPort}`,
    '--binlog-format=ROW',
    '--innodb-autoinc-lock-mode=2',
    '--default-storage-engine=InnoDB',
    ...(bootstrap ? ['--wsrep-new-cluster'] : []),
  ]
}

/** A wsrep status variable of a node (empty when the node does not answer). */
export function wsrepStatus(node: GaleraNode, name: string): string {
  try {
    const out = rootSql(node.db, `SHOW GLOBAL STATUS LIKE '${name}'`)
    return out.trim().split('\t')[1] ?? ''
  } catch {
    return ''
  }
}

const synced = (node: GaleraNode) => () =>
  wsrepStatus(node, 'wsrep_ready') === 'ON'
  && wsrepStatus(node, 'wsrep_local_state_comment') === 'Synced'

/** Starts node 1 as a new cluster, then each other node joining it (fresh data folders). */
export async function startGaleraCluster(nodes: GaleraNode[]) {
  ensureGalera()
  for (const node of nodes) {
    const joiner = node.index !== 1
    if (ping(node.db)) shutdown(node.db)
    rmSync(node.db.dataDir, { recursive: true, force: true })
    if (joiner) {
      // A joiner's data arrives through an rsync daemon, which drops root for `nobody`: the
      // empty folder must belong to that user (a throwaway folder under data/cluster/; the
      // node itself runs as root and reads it all the same).
      mkdirSync(node.db.dataDir, { recursive: true })
      const nobody = spawnSync('id', ['-u', 'nobody'], { encoding: 'utf8' })
      const nogroup = spawnSync('id', ['-g', 'nobody'], { encoding: 'utf8' })
      chownSync(node.db.dataDir, Number(nobody.stdout.trim()), Number(nogroup.stdout.trim()))
    }
    await startMariaDb(node.db, {
      serverArgs: nodeArgs(node, nodes, !joiner),
      ready: synced(node),
      timeoutS: 120,
      noInit: joiner,
    })
  }
  return {
    nodes,
    /** The cluster's size as node `n` sees it. */
    size: (n: GaleraNode) => Number(wsrepStatus(n, 'wsrep_cluster_size') || 0),
    stop: () => {
      // Joiners first, the bootstrap node last, so nobody is left waiting for a quorum.
      for (const node of [...nodes].reverse()) shutdown(node.db)
    },
  }
}

/** Kills a node at once (SIGKILL, no clean shutdown), as a crash would; gives its pid. */
export function killNode(node: GaleraNode) {
  const pid = Number(readFileSync(resolve(node.db.dataDir, 'mariadbd.pid'), 'utf8'))
  process.kill(pid, 'SIGKILL')
  return pid
}
