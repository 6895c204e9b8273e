// The planner's rate limit is one count for the whole deployment: requests from one address
// spread over two app instances (as a load balancer would) share a single allowance. A count
// kept in each process's memory would let the address through twice as often.
import { request } from 'node:http'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { KIT_PRESETS } from '../../shared/utils/planner/presets'
import { PLANNER_RATE_LIMIT } from '../../server/utils/rate-limits'
import { startAppInstance, type AppInstance } from '../helpers/instance'

const rig = KIT_PRESETS[0]!.rig
const gains = { kp: 4, kd: 2.5, ki: 0, n: 10, derivativeOn: 'measurement' }
const basePort = Number(new URL(inject('baseUrl')).port)

/** One planner call through the trusted proxy at 127.0.0.2, for a client address of its own. */
function analyzeFrom(port: number, clientIp: string) {
  const body = JSON.stringify({ rig, gains })
  return new Promise<{ status: number, remaining: string | undefined }>((done, fail) => {
    const req = request(
      {
        host: '127.0.0.1',
        port,
        path: '/api/planner/analyze',
        method: 'POST',
        localAddress: '127.0.0.2',
        headers: {
          'content-type': 'application/json',
          'content-length': Buffer.byteLength(body),
          'x-forwarded-for': clientIp,
        },
      },
      (res) => {
        res.resume()
        res.on('end', () =>
          done({
            status: res.statusCode!,
            remaining: res.headers['x-ratelimit-remaining'] as string | undefined,
          }),
        )
      },
    )
    req.on('error', fail)
    req.end(body)
  })
}

let second: AppInstance

beforeAll(async () => {
  second = await startAppInstance(basePort + 80)
}, 60_000)

afterAll(async () => {
  await second?.kill()
})

describe('planner rate limit across instances', () => {
  it('gives one address one allowance, however the requests are spread', async () => {
    const ip = `198.51.100.${Math.floor(Math.random() * 250) + 1}`
    const { limit } = PLANNER_RATE_LIMIT
    const ports = [basePort, basePort + 80]
    const statuses: number[] = []
    // Pairs at once, one to each instance, until refused (or well past one allowance).
    while (statuses.length < limit + 40 && !statuses.includes(429)) {
      const pair = await Promise.all(ports.map(p => analyzeFrom(p, ip)))
      statuses.push(...pair.map(r => r.status))
    }
    const allowed = statuses.filter(s => s === 200).length
    expect(statuses).toContain(429)
    // Each instance alone would have allowed `limit` (2 × limit in all); together they allow it
    // once. The sliding window weighs the previous minute's count by the part of it still
    // inside the last minute, so a run across a minute's boundary may get a few more.
    expect(allowed).toBeLessThanOrEqual(Math.ceil(limit * 1.1))
    expect(allowed).toBeGreaterThan(limit - 10)
    // The other instance refuses the address too, and another address is unaffected.
    expect((await analyzeFrom(ports[1]!, ip)).status).toBe(429)
    expect((await analyzeFrom(ports[0]!, ip)).status).toBe(429)
    expect((await analyzeFrom(ports[1]!, '203.0.113.7')).status).toBe(200)
  })
})
