// Small helpers for the project's own scripts: finding Debian packages' binaries and
// installing them with apt-get when this machine lacks them.
import { execFileSync, spawnSync } from 'node:child_process'
import { existsSync } from 'node:fs'

export function which(
  binary: string,
  extraDirs: string[] = ['/usr/sbin', '/usr/bin', '/usr/local/bin'],
): string | null {
  // A path names a file a package installs (a library such as Galera's provider).
  if (binary.includes('/')) return existsSync(binary) ? binary : null
  const r = spawnSync('sh', ['-c', `command -v ${binary}`], { encoding: 'utf8' })
  if (r.status === 0 && r.stdout.trim()) return r.stdout.trim()
  for (const dir of extraDirs) {
    const p = `${dir}/${binary}`
    if (existsSync(p)) return p
  }
  return null
}

let aptUpdated = false

/** Make sure `binary` exists; install Debian's `pkg` when it is missing and we may. */
export function ensureDebianPackage(binary: string, pkg: string, why: string): string {
  const found = which(binary)
  if (found) return found
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0
  if (!isRoot || !which('apt-get')) {
    throw new Error(
      `${binary} is missing (${why}). Install Debian's package "${pkg}" (apt-get install `
      + `${pkg}) and run this again.`,
    )
  }
  console.log(`[setup] ${binary} is missing; installing Debian's ${pkg} (${why})…`)
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  if (!aptUpdated) {
    execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env })
    aptUpdated = true
  }
  execFileSync('apt-get', ['install', '-y', '-qq', '--no-install-recommends', pkg], {
    stdio: 'inherit',
    env,
  })
  const after = which(binary)
  if (!after) throw new Error(`installed ${pkg} but ${binary} is still not found`)
  return after
}
