// The route list that the role matrix and the fuzzed bodies walk: file names become methods
// and paths the way Nitro's file router reads them.
import { describe, expect, it } from 'vitest'
import { apiRoutes, routeOf } from '../helpers/routes'

describe('routeOf', () => {
  it('reads the method suffix and turns [param] segments into :param', () => {
    expect(routeOf('orders/[id]/cancel.post.ts')).toMatchObject({
      method: 'POST',
      path: '/api/orders/:id/cancel',
      key: 'POST /api/orders/:id/cancel',
      file: 'server/api/orders/[id]/cancel.post.ts',
    })
    expect(routeOf('orders/[id]/builders/[userId].delete.ts')?.key)
      .toBe('DELETE /api/orders/:id/builders/:userId')
  })

  it('drops index from the path', () => {
    expect(routeOf('account/sessions/index.get.ts')?.key).toBe('GET /api/account/sessions')
    expect(routeOf('index.get.ts')?.key).toBe('GET /api')
  })

  it('lists a file without a method suffix as answering any method', () => {
    expect(routeOf('health.ts')).toMatchObject({ method: 'ANY', path: '/api/health' })
    expect(routeOf('files/[...path].ts')?.path).toBe('/api/files/**:path')
  })

  it('keeps dots that are not a method suffix, and skips what is not code', () => {
    expect(routeOf('sheets/[id]/export.get.ts')?.path).toBe('/api/sheets/:id/export')
    expect(routeOf('files/report.v2.ts'))
      .toMatchObject({ method: 'ANY', path: '/api/files/report.v2' })
    expect(routeOf('README.md')).toBeNull()
  })
})

describe('apiRoutes', () => {
  it('finds this repository\'s routes and nuxt-auth-utils\' session endpoint', () => {
    const keys = apiRoutes().map(r => r.key)
    expect(keys).toContain('POST /api/orders/:id/cancel')
    expect(keys).toContain('GET /api/products')
    expect(keys).toContain('GET /api/_auth/session')
    expect(keys).toContain('DELETE /api/_auth/session')
    expect(new Set(keys).size).toBe(keys.length)
  })
})
