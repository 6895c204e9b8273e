// A measured run saved with a tuning sheet: the logged run and the planner's fit go in with the
// sheet (or a later change to it), come back whole to the rig's people and to the support staff
// on a ticket the sheet is attached to, and a log whose columns disagree is refused by field.
import { beforeAll, describe, expect, it } from 'vitest'
import { DEFAULT_TARGETS, KIT_PRESETS } from '../../shared/utils/planner/presets'
import { planGains } from '../../shared/utils/planner/plan'
import { fitRun, parseRunCsv } from '../../shared/utils/planner/measured-run'
import { storedRun } from '../../shared/utils/measured-runs'
import type { Client } from '../helpers/client'
import { signedIn } from '../helpers/shop'
import { openTicket, ticketSpace } from '../helpers/tickets'
import { simulatedLog } from '../unit/planner/runs'

const rig = KIT_PRESETS[0]!.rig
const gains = planGains(rig, DEFAULT_TARGETS).gains!
const inputs = { rig, targets: DEFAULT_TARGETS, gains }

/** A 4 s logged run at the kit's 50 Hz, as the firmware snippet prints it (200 rows). */
const csv = () => simulatedLog(rig, gains, { duration: 4, noiseCounts: 1 })

let support: Client
let w: Awaited<ReturnType<typeof ticketSpace>>
beforeAll(async () => {
  support = await signedIn('support@tiltwright.test')
  w = await ticketSpace('runs')
})

describe('a measured run with its fit, saved with the sheet', () => {
  it('is kept whole and shown to the rig\'s people and the staff on a ticket', async () => {
    const parsed = parseRunCsv(csv(), rig)
    expect(parsed.errors).toEqual([])
    const measured = storedRun(parsed, fitRun(rig, gains, parsed.samples))
    expect(measured.fit?.fittedMm).toHaveLength(200)
    const saved = await w.one.client.post('/api/sheets', {
      title: 'With a run', rigId: w.rigs[0]!.id, inputs, measured,
    })
    expect(saved.status, JSON.stringify(saved.body)).toBe(201)
    const back = (await w.one.client.get(`/api/sheets/${saved.body.id}`)).body
    expect(back.measured).toEqual(JSON.parse(JSON.stringify(measured)))
    const onRig = (await w.teacher.client.get(`/api/rigs/${w.rigs[0]!.id}`)).body
    expect(onRig.sheets[0].measured.log.positionMm).toEqual(measured.log!.positionMm)

    const id = await openTicket(w.one.client, { rigId: w.rigs[0]!.id, sheetId: saved.body.id })
    const thread = (await support.get(`/api/tickets/${id}`)).body
    expect(thread.messages[0].sheet.measured.fit.kb).toBe(measured.fit!.kb)
    expect(thread.messages[0].sheet.measured.log.t).toHaveLength(200)
  })

  it('can be added to a sheet later, and cleared', async () => {
    const saved = await w.one.client.post('/api/sheets', {
      title: 'Run later', rigId: w.rigs[0]!.id, inputs,
    })
    const parsed = parseRunCsv(csv(), rig)
    const added = await w.one.client.patch(`/api/sheets/${saved.body.id}`, {
      measured: { settlingTime: 3, ...storedRun(parsed, null) },
    })
    expect(added.status).toBe(200)
    expect(added.body.measured.settlingTime).toBe(3)
    expect(added.body.measured.log.commandDeg).toHaveLength(200)
    expect(added.body.measured.fit).toBeUndefined()
    const cleared = await w.one.client.patch(`/api/sheets/${saved.body.id}`, { measured: null })
    expect(cleared.body.measured).toBeNull()
  })

  it('refuses a log whose columns disagree or run too long, naming the field', async () => {
    const log = storedRun(parseRunCsv(csv(), rig), null).log!
    const short = await w.one.client.post('/api/sheets', {
      title: 'Bad run', rigId: w.rigs[0]!.id, inputs,
      measured: { log: { ...log, commandDeg: log.commandDeg!.slice(1) } },
    })
    expect(short.status).toBe(422)
    expect(short.body.data.fields['measured.log.commandDeg'])
      .toBe('Every column of the log needs one value per row.')
    const t = Array.from({ length: 5001 }, (_, k) => k / 100)
    const long = await w.one.client.post('/api/sheets', {
      title: 'Long run', rigId: w.rigs[0]!.id, inputs,
      measured: { log: { unit: 'mm', t, positionMm: t, setpointMm: null, commandDeg: null } },
    })
    expect(long.status).toBe(422)
    expect(long.body.data.fields['measured.log.t']).toBe('Keep a run to 5000 rows or fewer.')
  })
})
