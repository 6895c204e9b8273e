// Every API route the app serves, read from the route files themselves, so a test that walks
// this list (the role matrix, the fuzzed bodies) meets a new route the day its file appears.
// Nitro's file routing: `server/api/orders/[id]/cancel.post.ts` is `POST /api/orders/:id/cancel`,
// `index` drops out of the path, and a file without a method suffix answers every method.
import { readdirSync } from 'node:fs'
import { join, relative, sep } from 'node:path'
import { fileURLToPath } from 'node:url'

export const METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const
export type Method = typeof METHODS[number]
/** `'ANY'`: a file without a method suffix, which h3 calls for every method. */
export type RouteMethod = Method | 'ANY'

export interface Route {
  method: RouteMethod
  path: string
  /** `METHOD /path`, the key the expectation tables use. */
  key: string
  /** The file, relative to the repository ('' for a route a module adds). */
  file: string
}

const ROOT = fileURLToPath(new URL('../..', import.meta.url))
const SUFFIXES: Record<string, Method> = {
  get: 'GET',
  post: 'POST',
  put: 'PUT',
  patch: 'PATCH',
  delete: 'DELETE',
}

/** Routes that a module registers rather than a file: nuxt-auth-utils' session endpoint. */
export const MODULE_ROUTES: Route[] = [
  { method: 'GET', path: '/api/_auth/session', key: 'GET /api/_auth/session', file: '' },
  { method: 'DELETE', path: '/api/_auth/session', key: 'DELETE /api/_auth/session', file: '' },
]

/**
 * The method and path of one route file, given relative to `server/api` with `/` separators
 * (`orders/[id]/cancel.post.ts`); null for a file that is not a route (not `.ts`/`.js`).
 */
export function routeOf(file: string): Route | null {
  const m = file.match(/^(.*)\.(ts|js|mjs)$/)
  if (!m) return null
  const parts = m[1]!.split('/')
  let last = parts.pop()!
  let method: RouteMethod = 'ANY'
  const dot = last.lastIndexOf('.')
  if (dot > 0 && SUFFIXES[last.slice(dot + 1)]) {
    method = SUFFIXES[last.slice(dot + 1)]!
    last = last.slice(0, dot)
  }
  if (last !== 'index') parts.push(last)
  const segments = parts.map(s =>
    s.replace(/^\[\.\.\.(\w*)\]$/, (_, n: string) => `**:${n || '_'}`)
      .replace(/\[(\w+)\]/g, ':$1'),
  )
  const path = ['/api', ...segments].join('/')
  return { method, path, key: `${method} ${path}`, file: `server/api/${file}` }
}

function walk(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap(e =>
    e.isDirectory() ? walk(join(dir, e.name)) : [join(dir, e.name)],
  )
}

/** Every route: the files under `server/api` and the module's own, sorted by key. */
export function apiRoutes(root = ROOT): Route[] {
  const base = join(root, 'server', 'api')
  const fromFiles = walk(base)
    .map(f => routeOf(relative(base, f).split(sep).join('/')))
    .filter((r): r is Route => r !== null)
  return [...fromFiles, ...MODULE_ROUTES].sort((a, b) => a.key.localeCompare(b.key))
}

/** Methods that change something: the routes a body can be sent to. */
export const isWrite = (r: Route) => r.method !== 'GET'
