// The app's page routes as patterns, for the server: `#page-routes` exports the paths of
// pages/ as regular expressions (sources), so a request for a path no page matches can be
// answered with the shared 404 snapshot (server/middleware/page-snapshots.ts) without rendering.
import { defineNuxtModule } from '@nuxt/kit'
import type { NuxtPage } from '@nuxt/schema'

function flatten(pages: NuxtPage[], parent = ''): string[] {
  return pages.flatMap((p) => {
    const path = p.path.startsWith('/') ? p.path : `${parent.replace(/\/$/, '')}/${p.path}`
    return [path, ...flatten(p.children ?? [], path)]
  })
}

/** '/kits/:slug()' → '^/kits/[^/]+$'; a catch-all (':x(.*)*') matches anything below. */
export function routePattern(path: string): string {
  const body = path
    .split('/')
    .map(s =>
      /^:\w+\(\.\*\)\*?$/.test(s)
        ? '.*'
        : s.startsWith(':')
          ? '[^/]+'
          : s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&'),
    )
    .join('/')
  return `^${body || '/'}/?$`
}

export default defineNuxtModule({
  meta: { name: 'page-routes' },
  setup(_options, nuxt) {
    let patterns: string[] = []
    nuxt.hook('pages:extend', (pages) => {
      patterns = [...new Set(flatten(pages).map(routePattern))]
    })
    nuxt.hook('nitro:config', (config) => {
      config.virtual ??= {}
      config.virtual['#page-routes'] = () => `export default ${JSON.stringify(patterns)}`
    })
  },
})
