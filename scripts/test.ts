// `npm test`: the linter, the type-check, then every vitest project (unit, then API + browser
// against one built server). Prints vitest's own report and a closing `N passed, N failed`
// line; a lint or type failure counts as one failure each.
import { spawnSync } from 'node:child_process'
import { mkdirSync, readFileSync, rmSync } from 'node:fs'
import { resolve } from 'node:path'
import { projectRoot } from './lib/mariadb'

const bin = (name: string) => resolve(projectRoot, 'node_modules/.bin', name)
const extra = process.argv.slice(2)

let typeErrors = 0
let lintErrors = 0
if (!extra.length) {
  console.log('[test] linting (eslint)…')
  const lint = spawnSync(bin('eslint'), ['.'], { cwd: projectRoot, stdio: 'inherit' })
  if (lint.status !== 0) lintErrors = 1
  console.log('[test] type-checking (nuxt typecheck)…')
  const tc = spawnSync(bin('nuxt'), ['typecheck'], { cwd: projectRoot, stdio: 'inherit' })
  if (tc.status !== 0) typeErrors = 1
}

const out = resolve(projectRoot, 'tests/.artifacts/vitest.json')
mkdirSync(resolve(out, '..'), { recursive: true })
rmSync(out, { force: true })
const run = spawnSync(
  bin('vitest'),
  ['run', '--reporter=default', '--reporter=json', `--outputFile.json=${out}`, ...extra],
  { cwd: projectRoot, stdio: 'inherit' },
)

let passed = 0
let failed = typeErrors + lintErrors
let skipped = 0
try {
  const report = JSON.parse(readFileSync(out, 'utf8')) as {
    numPassedTests: number
    numFailedTests: number
    numPendingTests: number
    numTodoTests: number
    numFailedTestSuites: number
  }
  passed = report.numPassedTests
  failed += report.numFailedTests + (report.numFailedTests === 0 ? report.numFailedTestSuites : 0)
  skipped = report.numPendingTests + report.numTodoTests
} catch {
  failed += 1
}
if (lintErrors) console.log('[test] the linter found problems (counted as one failure)')
if (typeErrors) console.log('[test] the type-check failed (counted as one failure)')
if (run.status !== 0 && failed === 0) failed = 1
console.log(`\n${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`)
process.exit(failed ? 1 : 0)
