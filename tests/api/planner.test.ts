// The planner routes and tuning sheets through the real server. The routes must answer
// exactly what the shared model computes (the page computes the same in the browser).
import { describe, expect, it } from 'vitest'
import { planGains } from '../../shared/utils/planner/plan'
import { analyzeLoop } from '../../shared/utils/planner/analyze'
import { DEFAULT_TARGETS, KIT_PRESETS } from '../../shared/utils/planner/presets'
import { Client } from '../helpers/client'

const rig = KIT_PRESETS[0]!.rig
const targets = DEFAULT_TARGETS
const json = <T>(v: T): T => JSON.parse(JSON.stringify(v))

describe('planner API (anonymous)', () => {
  it('plans gains exactly as the shared model does', async () => {
    const r = await new Client().post('/api/planner/plan', { rig, targets }, { csrf: false })
    expect(r.status).toBe(200)
    expect(r.body).toEqual(json(planGains(rig, targets)))
    expect(r.body.feasible).toBe(true)
    expect(r.body.gains.kp).toBeGreaterThan(0)
  })

  it('analyses given gains exactly as the shared model does', async () => {
    const gains = { kp: 4, kd: 2.5, ki: 0, n: 10, derivativeOn: 'measurement' as const }
    const r = await new Client().post('/api/planner/analyze', { rig, gains }, { csrf: false })
    expect(r.status).toBe(200)
    expect(r.body).toEqual(json(analyzeLoop(rig, gains)))
  })

  it('names every nonsense input field by field', async () => {
    const bad = {
      ...rig,
      beamLength: -0.4,
      leverArm: 'long',
      loopRate: 0,
      drive: 'rubber-band',
      railGap: 0.05,
      ballDiameter: 0.019,
    }
    const r = await new Client().post(
      '/api/planner/plan',
      { rig: bad, targets: { ...targets, form: 'PIDD', overshootPct: null } },
      { csrf: false },
    )
    expect(r.status).toBe(422)
    const f = r.body.data.fields
    expect(f['rig.beamLength']).toMatch(/Beam length.*greater than 0/)
    expect(f['rig.leverArm']).toMatch(/number/)
    expect(f['rig.loopRate']).toMatch(/Loop rate.*at least 10 Hz/)
    expect(f['rig.drive']).toMatch(/Drive/)
    expect(f['targets.form']).toMatch(/Controller form/)
    expect(f['targets.overshootPct']).toMatch(/Overshoot/)
  })

  it('refuses a loop rate and a settling time beyond what the kits build, saying why', async () => {
    for (const route of ['/api/planner/plan', '/api/planner/analyze']) {
      const body = route.endsWith('plan')
        ? { rig: { ...rig, loopRate: 100_000 }, targets: { ...targets, settlingTime: 600 } }
        : { rig: { ...rig, loopRate: 20_000 }, gains: { kp: 1, kd: 0.5, ki: 0, n: 10,
            derivativeOn: 'measurement' } }
      const r = await new Client().post(route, body, { csrf: false })
      expect(r.status).toBe(422)
      const f = r.body.data.fields
      expect(f['rig.loopRate']).toMatch(/Loop rate \(loopRate\) must be at most 1000 Hz: a hobby/)
      if (route.endsWith('plan')) expect(f['targets.settlingTime']).toMatch(/Settling time.*60/)
    }
  })

  it(
    'catches rigs that cannot be built: a lever arm longer than the beam, rails '
    + 'wider than the ball', async () => {
      const r = await new Client().post(
        '/api/planner/plan',
        { rig: { ...rig, leverArm: 0.5, railGap: 0.02 }, targets },
        { csrf: false },
      )
      expect(r.status).toBe(422)
      expect(r.body.data.fields['rig.leverArm']).toMatch(/longer than the beam/)
      expect(r.body.data.fields['rig.railGap']).toMatch(/smaller than the ball diameter/)
    })

  it('says so, with no gains, when the targets are too fast for the servo', async () => {
    const r = await new Client().post(
      '/api/planner/plan',
      { rig, targets: { ...targets, settlingTime: 0.1 } },
      { csrf: false },
    )
    expect(r.status).toBe(200)
    expect(r.body.feasible).toBe(false)
    expect(r.body.gains).toBeNull()
    expect(r.body.warnings.map((w: any) => w.code)).toContain('targets-infeasible')
  })
})

describe('tuning sheets', () => {
  const inputs = () => ({ rig, targets, gains: { ...planGains(rig, targets).gains! } })

  it('keeps sheets to teachers and builders, and each sheet to its author', async () => {
    expect((await new Client().get('/api/sheets')).status).toBe(401)
    const support = new Client()
    await support.signIn('support@tiltwright.test')
    expect((await support.post('/api/sheets', { title: 'x', inputs: inputs() })).status).toBe(403)

    const builder = new Client()
    await builder.signIn('builder@tiltwright.test')
    const created = await builder.post('/api/sheets', {
      title: 'Bench 3, first try',
      note: 'Wobbles a little at the far end.',
      inputs: inputs(),
    })
    expect(created.status).toBe(201)
    const id = created.body.id

    const mine = await builder.get('/api/sheets')
    expect(mine.body.data[0]).toMatchObject({ id, title: 'Bench 3, first try', stable: true })

    const teacher = new Client()
    await teacher.signIn('teacher@tiltwright.test')
    expect((await teacher.get(`/api/sheets/${id}`)).status).toBe(404)
    expect((await teacher.get(`/api/sheets/${id}/export`)).status).toBe(404)
    expect((await teacher.request('DELETE', `/api/sheets/${id}`)).status).toBe(404)
    expect(
      (await teacher.get('/api/sheets')).body.data.find((s: any) => s.id === id),
    ).toBeUndefined()
  })

  it('computes the results on the server, whatever the client sends', async () => {
    const builder = new Client()
    await builder.signIn('builder@tiltwright.test')
    const { id } = (
      await builder.post('/api/sheets', {
        title: 'Hand-tuned',
        inputs: {
          ...inputs(),
          gains: { kp: 40, kd: 0.01, ki: 0, n: 10, derivativeOn: 'measurement' },
        },
        results: { analysis: { stable: true } },
      })
    ).body
    const sheet = await builder.get(`/api/sheets/${id}`)
    expect(sheet.body.results.analysis.stable).toBe(false)
    expect(sheet.body.results.suggested.kp).toBeCloseTo(planGains(rig, targets).gains!.kp, 9)
  })

  it('exports a sheet file and imports it back, recomputing its results', async () => {
    const builder = new Client()
    await builder.signIn('builder@tiltwright.test')
    const { id } = (await builder.post('/api/sheets', { title: 'To share', inputs: inputs() })).body
    const file = await builder.get(`/api/sheets/${id}/export`)
    expect(file.status).toBe(200)
    expect(file.headers.get('content-disposition')).toMatch(
      /attachment; filename="tuning-sheet-\d+-to-share\.tiltsheet\.json"/,
    )
    expect(file.body).toMatchObject({
      format: 'tiltwright-tuning-sheet',
      version: 1,
      title: 'To share',
      inputs: json(inputs()),
    })

    const tampered = {
      ...file.body,
      title: 'Imported copy',
      results: { analysis: { stable: false } },
    }
    const teacher = new Client()
    await teacher.signIn('teacher@tiltwright.test')
    const imported = await teacher.post('/api/sheets/import', tampered)
    expect(imported.status).toBe(201)
    const copy = await teacher.get(`/api/sheets/${imported.body.id}`)
    expect(copy.body.title).toBe('Imported copy')
    expect(copy.body.results.analysis.stable).toBe(true)
  })

  it('refuses a file that is not a Tiltwright sheet, saying why', async () => {
    const teacher = new Client()
    await teacher.signIn('teacher@tiltwright.test')
    const r = await teacher.post('/api/sheets/import', {
      format: 'something-else',
      version: 3,
      title: '',
      inputs: { rig: { ...rig, adcBits: 40 } },
    })
    expect(r.status).toBe(422)
    const f = r.body.data.fields
    expect(f.format).toMatch(/not a Tiltwright tuning sheet/)
    expect(f.version).toMatch(/version 1/)
    expect(f.title).toMatch(/title/)
    expect(f['inputs.rig.adcBits']).toMatch(/at most 24 bits/)
  })

  it('edits the note and archives a sheet', async () => {
    const builder = new Client()
    await builder.signIn('builder@tiltwright.test')
    const { id } = (await builder.post('/api/sheets', { title: 'Edit me', inputs: inputs() })).body
    const patched = await builder.patch(`/api/sheets/${id}`, {
      note: 'Settles in about 3 s on the real rig.',
    })
    expect(patched.body.note).toBe('Settles in about 3 s on the real rig.')
    expect(
      (await builder.patch(`/api/sheets/${id}`, { title: '' })).body.data.fields.title,
    ).toBeDefined()
    expect((await builder.request('DELETE', `/api/sheets/${id}`)).status).toBe(200)
    expect((await builder.get(`/api/sheets/${id}`)).status).toBe(404)
  })
})

describe('planner rate limit', () => {
  // Last in this file: it spends this address's allowance for a minute.
  it('answers 429 once an address exceeds its allowance', async () => {
    const c = new Client()
    const statuses: number[] = []
    for (let i = 0; i < 250 && !statuses.includes(429); i++)
      statuses.push(
        (
          await c.post(
            '/api/planner/analyze',
            { rig, gains: { kp: 4, kd: 2.5, ki: 0, n: 10, derivativeOn: 'measurement' } },
            { csrf: false },
          )
        ).status,
      )
    expect(statuses[0]).toBe(200)
    expect(statuses).toContain(429)
    expect(statuses.indexOf(429)).toBeGreaterThan(200)
  })
})
