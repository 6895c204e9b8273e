// Work that does not depend on the request is done once per process, not once per request.
// - Runtime config: Nitro's useRuntimeConfig(event) clones the whole config and re-applies the
//   environment for every request that asks (nuxt-csurf, nuxt-auth-utils and nuxt-security do,
//   on every call). Nothing here overrides config per request, and the process-wide copy is
//   frozen, so each request is handed that one.
// - Route rules: fixed at build time, so the rules merged for a path are kept (a bounded map).
// - nuxt-security's rules for a path: the module builds a new router from a deep copy of all its
//   options for every request to find them. For API paths (never rendered, so nothing edits
//   them: its render hooks write the nonce into them) the first request's answer is kept.
// - nuxt-security's CSP nonce: drawn from the CSPRNG for every request, but only a rendered page
//   uses it (its render hooks write it into the page and its CSP header). An API reply or a
//   built file is never rendered, so it gets none: the module's hook skips a request whose
//   context already holds a nonce, and NOT_RENDERED marks those with an empty placeholder.
// - Snapshots (server/utils/snapshots.ts): a write answered here drops them before its reply
//   leaves, so the caller's next read sees the change.
import type { H3Event } from 'h3'

const ROUTE_RULES_KEPT = 2000
const READS = new Set(['GET', 'HEAD', 'OPTIONS'])
/** Paths whose replies are never rendered HTML: the API and the build's own files. */
const NOT_RENDERED = /^\/(api|_nuxt)\//
/** Stands for "no nonce" (truthy, so nuxt-security's request hook leaves it alone). */
const NO_NONCE = 'none-not-rendered'

export default defineNitroPlugin((nitro) => {
  const config = useRuntimeConfig()
  const rulesByPath = new Map<string, ReturnType<typeof getRouteRules>>()
  const securityByPath = new Map<string, unknown>()
  nitro.hooks.hook('request', (event) => {
    const ctx = event.context as H3Event['context'] & {
      nitro?: { runtimeConfig?: unknown }
      _nitro?: { routeRules?: unknown }
    }
    ctx.nitro ??= {}
    ctx.nitro.runtimeConfig = config
    const path = event.path.split('?')[0]!
    let rules = rulesByPath.get(path)
    if (!rules) {
      rules = getRouteRules(event)
      if (rulesByPath.size >= ROUTE_RULES_KEPT) rulesByPath.clear()
      rulesByPath.set(path, rules)
    }
    ctx._nitro ??= {}
    ctx._nitro.routeRules = rules
    if (!NOT_RENDERED.test(path)) return
    const security = path.startsWith('/api/') && securityByPath.get(path)
    event.context.security = security
      ? { rules: security, nonce: NO_NONCE }
      : { nonce: NO_NONCE }
  })
  const wrote = (event: H3Event | undefined) => {
    if (event && !READS.has(event.method)) dropSnapshots()
  }
  nitro.hooks.hook('beforeResponse', event => wrote(event))
  nitro.hooks.hook('error', (_e, { event }) => wrote(event))
  // After the reply, when nuxt-security's own hooks have resolved the rules for the path.
  nitro.hooks.hook('afterResponse', (event) => {
    const path = event.path.split('?')[0]!
    const rules = (event.context.security as { rules?: unknown } | undefined)?.rules
    if (!path.startsWith('/api/') || !rules || securityByPath.has(path)) return
    if (securityByPath.size >= ROUTE_RULES_KEPT) securityByPath.clear()
    securityByPath.set(path, rules)
  })
})
