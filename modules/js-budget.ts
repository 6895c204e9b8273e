// First-load JavaScript budget, checked by every `nuxt build`: for each storefront page, the
// gzip size of the JavaScript a visitor's browser loads before first paint (the entry, the
// default layout and the page's chunk, each with its static imports) is printed as a table, and
// the build fails when one passes JS_BUDGET_KB. Lazy chunks (dynamic imports, the planner's
// worker) do not count: they load after first paint. docs/benchmarks.md explains the figures.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { gzipSync } from 'node:zlib'
import { defineNuxtModule } from '@nuxt/kit'

export const JS_BUDGET_KB = 100
const STOREFRONT = {
  home: 'pages/index.vue',
  kits: 'pages/kits/index.vue',
  kit: 'pages/kits/[slug].vue',
  cart: 'pages/cart.vue',
  help: 'pages/help.vue',
}

interface Chunk {
  file: string
  isEntry?: boolean
  imports?: string[]
}

/** The files `keys` load at once: each chunk and, recursively, its static imports. */
function staticClosure(manifest: Record<string, Chunk>, keys: string[]): Set<string> {
  const seen = new Set<string>()
  const files = new Set<string>()
  const visit = (key: string) => {
    const chunk = manifest[key]
    if (!chunk || seen.has(key)) return
    seen.add(key)
    if (chunk.file.endsWith('.js')) files.add(chunk.file)
    for (const i of chunk.imports ?? []) visit(i)
  }
  keys.forEach(visit)
  return files
}

export default defineNuxtModule({
  meta: { name: 'js-budget' },
  setup(_options, nuxt) {
    if (nuxt.options.dev) return
    nuxt.hook('build:manifest', (manifest) => {
      const chunks = manifest as unknown as Record<string, Chunk>
      const dir = join(nuxt.options.buildDir, 'dist/client', nuxt.options.app.buildAssetsDir)
      const gz = new Map<string, number>()
      const sizeOf = (file: string) => {
        if (!gz.has(file)) gz.set(file, gzipSync(readFileSync(join(dir, file))).length)
        return gz.get(file)!
      }
      const entries = Object.keys(chunks).filter(k => chunks[k]!.isEntry)
      const rows = Object.entries(STOREFRONT).map(([name, page]) => {
        const files = staticClosure(chunks, [...entries, 'layouts/default.vue', page])
        const kb = [...files].reduce((s, f) => s + sizeOf(f), 0) / 1024
        return { name, page, files: files.size, kb }
      })
      console.log(`[js-budget] first-load JS per storefront page (gzip, budget ${JS_BUDGET_KB} kB)`)
      for (const r of rows)
        console.log(`[js-budget] first-load JS ${r.name.padEnd(5)} `
          + `${r.kb.toFixed(1).padStart(6)} kB in ${r.files} files`
          + `${r.kb > JS_BUDGET_KB ? '  OVER BUDGET' : ''}`)
      const over = rows.filter(r => r.kb > JS_BUDGET_KB)
      if (over.length)
        throw new Error(`[js-budget] over ${JS_BUDGET_KB} kB of first-load JS (gzip): `
          + over.map(r => `${r.page} ${r.kb.toFixed(1)} kB`).join(', '))
    })
  },
})
