// Build spaces through the real server: opening one when an order is paid or its purchase order
// approved (once), who may see, work on and manage rigs (everyone else gets 404), the
// checklist, sheets saved to a rig, the board's filters and sort, and no price ever reaching a
// builder.
import { describe, expect, it } from 'vitest'
import { DEFAULT_TARGETS, KIT_PRESETS } from '../../shared/utils/planner/presets'
import { planGains } from '../../shared/utils/planner/plan'
import { Client } from '../helpers/client'
import { jobsSettled, sql } from '../helpers/db'
import { mailsTo } from '../helpers/mail'
import { newTeacher, poForm, productWithStock, signedIn } from '../helpers/shop'
import { board, joinAs, newCode, orderOfKits } from '../helpers/build'

const rig = KIT_PRESETS[0]!.rig
const inputs = () => ({
  rig,
  targets: DEFAULT_TARGETS,
  gains: { ...planGains(rig, DEFAULT_TARGETS).gains! },
})

/** Every build-space mail a teacher was sent, once the mail jobs have run. */
async function buildMails(email: string) {
  await jobsSettled({ to: email })
  return (await mailsTo(email)).filter(m => /build space/.test(m.subject))
}

describe('opening a build space', () => {
  it('makes one rig per kit unit when the purchase order is approved, and no more when '
    + 'it is paid', async () => {
    const { admin, teacher, orderId } = await orderOfKits('open', 3)
    const order = (await teacher.client.get(`/api/orders/${orderId}`)).body
    expect(order.buildSpace).toEqual({ open: true, rigs: 3 })
    const opened = order.events.filter((e: any) => e.kind === 'build-space')
    expect(opened.map((e: any) => e.message)).toEqual([
      'Build space opened: 3 rigs ready for the class.',
    ])
    const b = await board(teacher.client, orderId)
    expect(b.rigs.map((r: any) => r.serial)).toEqual(
      [1, 2, 3].map(n => `${order.number}-0${n}`),
    )
    expect(b.totals).toEqual({ rigs: 3, finished: 0, stuck: 0, retired: 0 })

    const paid = await admin.post(`/api/admin/orders/${orderId}/payments`, { reference: 'C-1' })
    expect(paid.status).toBe(200)
    expect((await board(teacher.client, orderId)).rigs).toHaveLength(3)
    const mails = await buildMails(teacher.email)
    expect(mails).toHaveLength(1)
    expect(mails[0]!.text).toContain(`/orders/${orderId}/build`)
    expect(mails[0]!.text).toContain('3 rigs are ready')
    expect(mails[0]!.text).toMatch(/need no e-mail\s+address/)
  })

  it('answers 409 not-open before approval and for an order without kits', async () => {
    const waiting = await orderOfKits('notyet', 2, { approve: false })
    const r = await waiting.teacher.client.get(`/api/orders/${waiting.orderId}/board`)
    expect(r.status).toBe(409)
    expect(r.body.data.code).toBe('not-open')
    expect(r.body.message).toMatch(/paid or its purchase order is approved/)
    const code = await waiting.teacher.client.post(`/api/orders/${waiting.orderId}/join-codes`, {})
    expect(code.status).toBe(409)
    const order = (await waiting.teacher.client.get(`/api/orders/${waiting.orderId}`)).body
    expect(order.buildSpace).toEqual({ open: false, rigs: 0 })

    const admin = await signedIn('admin@tiltwright.test')
    const part = await productWithStock(admin, 3)
    const t = await newTeacher('parts')
    const placed = await t.client.post(
      '/api/checkout/purchase-order',
      poForm({ lines: [{ productId: part.productId, quantity: 2 }] }),
    )
    await admin.post(`/api/admin/orders/${placed.body.orderId}/approve`, {})
    const none = await t.client.get(`/api/orders/${placed.body.orderId}/board`)
    expect(none.status).toBe(409)
    expect(none.body.message).toMatch(/Only kits become rigs/)
    expect((await t.client.get(`/api/orders/${placed.body.orderId}`)).body.buildSpace).toBeNull()
    expect(await buildMails(t.email)).toHaveLength(0)
  })

  it('opens on the board for an order approved before build spaces existed', async () => {
    const { teacher, orderId } = await orderOfKits('lazy', 2)
    await sql('DELETE FROM rigs WHERE order_id = ?', [orderId])
    const b = await board(teacher.client, orderId)
    expect(b.rigs).toHaveLength(2)
    // A second look opens nothing more.
    expect((await board(teacher.client, orderId)).rigs).toHaveLength(2)
  })
})

describe('who may see and change a rig', () => {
  it('lets the teacher manage, builders work, staff read; everyone else gets 404', async () => {
    const a = await orderOfKits('rolesa', 2)
    const other = await orderOfKits('rolesb', 1)
    const rigA = (await board(a.teacher.client, a.orderId)).rigs[0].id
    const rigB = (await board(other.teacher.client, other.orderId)).rigs[0].id
    const { client: builder } = await joinAs((await newCode(a.teacher.client, a.orderId)).code)
    const support = await signedIn('support@tiltwright.test')
    const admin = await signedIn('admin@tiltwright.test')
    const tick = { done: true, note: 'Square and level.' }

    const mine = await builder.get(`/api/rigs/${rigA}`)
    expect(mine.status).toBe(200)
    expect(mine.body.may).toEqual({ manage: false, work: true })
    expect((await builder.request('PUT', `/api/rigs/${rigA}/steps/frame`, tick)).status).toBe(200)
    expect((await builder.patch(`/api/rigs/${rigA}`, { name: 'Mine' })).status).toBe(404)
    expect((await builder.get(`/api/orders/${a.orderId}/board`)).status).toBe(404)
    expect((await builder.post(`/api/orders/${a.orderId}/join-codes`, {})).status).toBe(404)
    // Another build space's rig does not exist for this builder.
    expect((await builder.get(`/api/rigs/${rigB}`)).status).toBe(404)
    expect((await builder.request('PUT', `/api/rigs/${rigB}/steps/frame`, tick)).status)
      .toBe(404)

    // The teacher of another school.
    const t2 = other.teacher.client
    expect((await t2.get(`/api/rigs/${rigA}`)).status).toBe(404)
    expect((await t2.get(`/api/orders/${a.orderId}/board`)).status).toBe(404)
    expect((await t2.post(`/api/orders/${a.orderId}/join-codes`, {})).status).toBe(404)
    expect((await t2.patch(`/api/rigs/${rigA}`, { name: 'Theirs' })).status).toBe(404)

    for (const staff of [support, admin]) {
      const seen = await staff.get(`/api/rigs/${rigA}`)
      expect(seen.status).toBe(200)
      expect(seen.body.may).toEqual({ manage: false, work: false })
      const b = await staff.get(`/api/orders/${a.orderId}/board`)
      expect(b.status).toBe(200)
      expect(b.body.joinCodes).toEqual([])
      expect((await staff.request('PUT', `/api/rigs/${rigA}/steps/frame`, tick)).status)
        .toBe(404)
      expect((await staff.patch(`/api/rigs/${rigA}`, { name: 'Staff' })).status).toBe(404)
      expect((await staff.post(`/api/orders/${a.orderId}/join-codes`, {})).status).toBe(404)
    }
    expect((await a.teacher.client.get(`/api/orders/${a.orderId}/board`)).body.joinCodes)
      .toHaveLength(1)

    const anonymous = new Client()
    expect((await anonymous.get(`/api/rigs/${rigA}`)).status).toBe(401)
    expect((await anonymous.get(`/api/orders/${a.orderId}/board`)).status).toBe(401)
    expect((await anonymous.post(`/api/orders/${a.orderId}/join-codes`, {})).status).toBe(401)
    expect((await anonymous.get('/api/rigs/99999999')).status).toBe(401)
    expect((await a.teacher.client.get('/api/rigs/99999999')).status).toBe(404)
  })

  it('records who ticked a step and when; unticking keeps the note; a retired rig takes no '
    + 'more ticks', async () => {
    const { teacher, orderId } = await orderOfKits('steps', 1)
    const rigId = (await board(teacher.client, orderId)).rigs[0].id
    const { client: builder, user } = await joinAs(
      (await newCode(teacher.client, orderId)).code,
      'Noor K.',
    )
    const ticked = await builder.request('PUT', `/api/rigs/${rigId}/steps/frame`, {
      done: true,
      note: 'Pivot needed a washer.',
    })
    expect(ticked.status).toBe(200)
    const frame = ticked.body.checklist.find((s: any) => s.step === 'frame')
    expect(frame).toMatchObject({ done: true, doneBy: user.name, note: 'Pivot needed a washer.' })
    expect(Date.now() - new Date(frame.doneAt).getTime()).toBeLessThan(60_000)
    expect(ticked.body.currentStep).toBe('linkage')
    expect(ticked.body.lastActivityAt).not.toBeNull()

    const unticked = await teacher.client.request('PUT', `/api/rigs/${rigId}/steps/frame`, {
      done: false,
    })
    const after = unticked.body.checklist.find((s: any) => s.step === 'frame')
    expect(after).toMatchObject({ done: false, doneAt: null, doneBy: null })
    expect(after.note).toBe('Pivot needed a washer.')
    expect(after.updatedBy).toBe('Teacher steps')
    expect(unticked.body.currentStep).toBe('frame')

    const bad = await builder.request('PUT', `/api/rigs/${rigId}/steps/frame`, { done: 'yes' })
    expect(bad.status).toBe(422)
    expect(bad.body.data.fields.done).toBeTruthy()
    expect((await builder.request('PUT', `/api/rigs/${rigId}/steps/soldering`, { done: true }))
      .status).toBe(404)

    const retired = await teacher.client.patch(`/api/rigs/${rigId}`, { retired: true })
    expect(retired.body.retired).toBe(true)
    const late = await builder.request('PUT', `/api/rigs/${rigId}/steps/frame`, { done: true })
    expect(late.status).toBe(409)
  })

  it('keeps the measured dimensions and a calibration that fits, refusing one that does '
    + 'not', async () => {
    const { teacher, orderId } = await orderOfKits('measure', 1)
    const rigId = (await board(teacher.client, orderId)).rigs[0].id
    const { client: builder } = await joinAs((await newCode(teacher.client, orderId)).code)
    const dims = await builder.request('PUT', `/api/rigs/${rigId}/dimensions`, { rig })
    expect(dims.status).toBe(200)
    expect(dims.body.dimensions.leverArm).toBe(rig.leverArm)
    const pairs = [
      { reading: 100, position: -0.15 },
      { reading: 500, position: 0 },
      { reading: 900, position: 0.15 },
    ]
    const cal = await builder.request('PUT', `/api/rigs/${rigId}/calibration`, {
      adcBits: 10,
      pairs,
    })
    expect(cal.status).toBe(200)
    expect(cal.body.calibration.fit.ok).toBe(true)
    expect(cal.body.calibration.pairs).toEqual(pairs)
    const flat = await builder.request('PUT', `/api/rigs/${rigId}/calibration`, {
      adcBits: 10,
      pairs: [{ reading: 300, position: 0 }, { reading: 300, position: 0.1 }],
    })
    expect(flat.status).toBe(422)
    expect(flat.body.data.fields.pairs).toBeTruthy()
  })
})

describe('tuning sheets on a rig', () => {
  it('saves the planner to a rig for its builders only and lists the history', async () => {
    const { teacher, orderId } = await orderOfKits('sheets', 1)
    const other = await orderOfKits('sheetsb', 1)
    const rigId = (await board(teacher.client, orderId)).rigs[0].id
    const { client: builder, user } = await joinAs(
      (await newCode(teacher.client, orderId)).code,
      'Lior P.',
    )
    const { client: stranger } = await joinAs(
      (await newCode(other.teacher.client, other.orderId)).code,
    )
    const saved = await builder.post('/api/sheets', {
      title: 'First gains',
      rigId,
      inputs: inputs(),
      verdict: 'oscillates',
      measured: { settlingTime: 2.5, overshootPct: 30 },
    })
    expect(saved.status).toBe(201)
    await builder.post('/api/sheets', { title: 'Calmer', rigId, inputs: inputs() })
    const view = (await teacher.client.get(`/api/rigs/${rigId}`)).body
    expect(view.sheets.map((s: any) => s.title)).toEqual(['Calmer', 'First gains'])
    expect(view.sheets[1]).toMatchObject({
      id: saved.body.id,
      authorName: user.name,
      verdict: 'oscillates',
      measured: { settlingTime: 2.5, overshootPct: 30 },
    })
    expect(typeof view.sheets[1].stable).toBe('boolean')
    expect(view.lastActivityAt).not.toBeNull()
    // The teacher reads the builder's sheet; only its author changes it.
    expect((await teacher.client.get(`/api/sheets/${saved.body.id}`)).status).toBe(200)
    const verdict = await builder.patch(`/api/sheets/${saved.body.id}`, { verdict: 'balances' })
    expect(verdict.status).toBe(200)
    expect((await teacher.client.get(`/api/rigs/${rigId}`)).body.sheets[1].verdict)
      .toBe('balances')

    const theirs = { title: 'Not mine', rigId, inputs: inputs() }
    const refused = await stranger.post('/api/sheets', theirs)
    expect(refused.status).toBe(404)
    expect(refused.body.message).toBe('That rig was not found.')
    expect((await stranger.get(`/api/sheets/${saved.body.id}`)).status).toBe(404)
    expect((await other.teacher.client.get(`/api/sheets/${saved.body.id}`)).status).toBe(404)
  })
})

describe('the progress board', () => {
  it('filters by group, step, stuck and words, sorts by progress, and counts before '
    + 'filtering', async () => {
    const { teacher, orderId } = await orderOfKits('board', 4)
    const t = teacher.client
    const [a, b, c, d] = (await board(t, orderId)).rigs.map((r: any) => r.id)
    await t.patch(`/api/rigs/${a}`, { groupLabel: 'Bench 1' })
    await t.patch(`/api/rigs/${c}`, { groupLabel: 'Bench 1', name: 'Comet' })
    await t.patch(`/api/rigs/${b}`, { groupLabel: 'Bench 2' })
    await t.patch(`/api/rigs/${d}`, { retired: true })
    const ticks = [[a, ['frame']], [b, ['frame']], [c, ['frame', 'linkage']]] as const
    for (const [rigId, steps] of ticks) {
      for (const step of steps)
        expect((await t.request('PUT', `/api/rigs/${rigId}/steps/${step}`, { done: true })).status)
          .toBe(200)
    }
    const { user, username } = await joinAs((await newCode(t, orderId)).code, 'Ivo M.')
    const moved = await t.patch(`/api/orders/${orderId}/builders/${user.id}`, { rigId: b })
    expect(moved.body).toMatchObject({ id: user.id, name: 'Ivo M.', username, rigId: b })
    const elsewhere = await orderOfKits('boardb', 1)
    const foreignRig = (await board(elsewhere.teacher.client, elsewhere.orderId)).rigs[0].id
    const wrong = await t.patch(`/api/orders/${orderId}/builders/${user.id}`, { rigId: foreignRig })
    expect(wrong.status).toBe(422)
    expect(wrong.body.data.fields.rigId).toBeTruthy()
    // The space opened three hours ago; rig b has sat on its linkage since two hours ago.
    await sql('UPDATE rigs SET created_at = NOW(3) - INTERVAL 3 HOUR WHERE order_id = ?', [orderId])
    await sql(`UPDATE rig_steps SET done_at = NOW(3) - INTERVAL 2 HOUR WHERE rig_id = ?`, [b])

    const all = await board(t, orderId)
    expect(all.totals).toEqual({ rigs: 4, finished: 0, stuck: 1, retired: 1 })
    expect(all.rigs.map((r: any) => r.id)).toEqual([a, b, c])
    expect(all.groups).toEqual(['Bench 1', 'Bench 2'])
    expect(Date.now() - new Date(all.updatedAt).getTime()).toBeLessThan(60_000)
    const ids = async (q: string) => (await board(t, orderId, q)).rigs.map((r: any) => r.id)
    expect(await ids('?stuck=true')).toEqual([b])
    expect(await ids('?stuck=false')).toEqual([a, c])
    expect(await ids('?group=Bench%201')).toEqual([a, c])
    expect(await ids('?step=linkage')).toEqual([a, b])
    expect(await ids('?step=wiring')).toEqual([c])
    expect(await ids('?q=comet')).toEqual([c])
    expect(await ids(`?q=${username}`)).toEqual([b])
    expect(await ids('?sort=progress&dir=desc')).toEqual([c, a, b])
    expect(await ids('?retired=true')).toEqual([a, b, c, d])
    const bad = await t.get(`/api/orders/${orderId}/board?sort=colour`)
    expect(bad.status).toBe(422)
    expect(bad.body.data.fields.sort).toBeTruthy()
  })
})

/** Every key and value of a reply that could carry money. */
function moneyIn(value: unknown, path = ''): string[] {
  if (Array.isArray(value)) return value.flatMap((v, i) => moneyIn(v, `${path}[${i}]`))
  if (typeof value === 'string') return /\$\s?\d/.test(value) ? [`${path}: ${value}`] : []
  if (!value || typeof value !== 'object') return []
  return Object.entries(value).flatMap(([k, v]) => {
    const here = `${path}.${k}`
    // The catalog answers a builder with an empty price list: the key is there, no price is.
    // A list's `meta.total` counts its rows.
    const moneyKey = /cents|price|total|amount|payment|invoice|address/i.test(k)
      && !(Array.isArray(v) && v.length === 0)
      && here !== '.meta.total'
    return [...(moneyKey ? [here] : []), ...moneyIn(v, here)]
  })
}

describe('a builder and money', () => {
  it('never receives a price, total, payment, invoice or address', async () => {
    const { teacher, orderId } = await orderOfKits('money', 2)
    const rigId = (await board(teacher.client, orderId)).rigs[0].id
    const { client: builder } = await joinAs((await newCode(teacher.client, orderId)).code)
    const sheet = await builder.post('/api/sheets', { title: 'Gains', rigId, inputs: inputs() })
    const products = (await builder.get('/api/products')).body
    const paths = [
      '/api/_auth/session',
      '/api/account',
      '/api/build-spaces',
      `/api/rigs/${rigId}`,
      '/api/sheets',
      `/api/sheets/${sheet.body.id}`,
      '/api/products',
      `/api/products/${products.data[0].slug}`,
    ]
    for (const path of paths) {
      const r = await builder.get(path)
      expect(r.status, path).toBe(200)
      expect(moneyIn(r.body), path).toEqual([])
    }
    // The check itself finds money where there is some.
    expect(moneyIn((await teacher.client.get(`/api/orders/${orderId}`)).body).length)
      .toBeGreaterThan(0)
    const spaces = (await builder.get('/api/build-spaces')).body
    expect(spaces).toHaveLength(1)
    expect(spaces[0]).toMatchObject({ orderId, rigs: 2, myRigs: [] })
    // Not on a rig yet, the builder still sees every rig of the class, by serial.
    const serials = spaces[0].classRigs.map((r: { serial: string }) => r.serial)
    expect(serials).toHaveLength(2)
    expect(serials).toEqual([...serials].sort())
  })

  it('lists a teacher\'s build spaces and none for staff', async () => {
    const { teacher, orderId } = await orderOfKits('spaces', 2)
    await board(teacher.client, orderId)
    const mine = (await teacher.client.get('/api/build-spaces')).body
    expect(mine.map((s: any) => s.orderId)).toEqual([orderId])
    expect(mine[0]).toMatchObject({ rigs: 2, finished: 0, stuck: 0, myRigs: [], classRigs: [] })
    const support = await signedIn('support@tiltwright.test')
    expect((await support.get('/api/build-spaces')).body).toEqual([])
  })
})
