// Corrective actions (ISO/IEC 17025:2017 8.7): linked to a nonconformity; actions with owners and due
// dates; overdue ones on the quality manager's overview and in the daily mail (its preview); only the
// owner or a quality manager marks an action done; the effectiveness check needs every action done,
// and the action cannot close before an effectiveness check is recorded — and found effective (409).
import { beforeAll, describe, expect, it } from 'vitest'
import { addDays } from '../../shared/mail/milestones'
import { signedIn, type Client } from '../support/http'

let tech: Client
let quality: Client
let admin: Client
let today: string
let techId: number
let qualityId: number

beforeAll(async () => {
  ;[tech, quality, admin] = await Promise.all([signedIn('technician'), signedIn('quality'), signedIn('admin')])
  today = (await tech.get('/api/settings/today')).body.today
  techId = (await tech.get('/api/auth/me')).body.id
  qualityId = (await quality.get('/api/auth/me')).body.id
})

describe('a corrective action', () => {
  let action: { id: number, number: string, version: number, items: { id: number, ownerId: number }[] }

  it('is opened for a nonconformity, with actions that have owners and due dates; bad links and owners are 400', async () => {
    const nc = await tech.post('/api/nonconformities', { title: 'Worksheet copied by hand', description: 'A reading was copied from the wrong line.', risk: 'low' })
    expect(nc.status, JSON.stringify(nc.body)).toBe(201)
    expect(nc.body).toMatchObject({ origin: 'manual', status: 'open', withhold: false, affected: null })
    const unlinked = await quality.post('/api/corrective-actions', { title: 'x', cause: 'y' })
    expect(unlinked.status).toBe(400)
    expect(unlinked.body.data.fields).toHaveProperty('nonconformityId')
    const customerId = (await (await signedIn('customer')).get('/api/auth/me')).body.id
    const badOwner = await quality.post('/api/corrective-actions', { nonconformityId: nc.body.id, title: 'x', cause: 'y', items: [{ description: 'z', ownerId: customerId, dueDate: today }] })
    expect(badOwner.status).toBe(400)
    expect(badOwner.body.data.fields).toHaveProperty('items[0].ownerId')
    expect((await tech.post('/api/corrective-actions', { nonconformityId: nc.body.id, title: 'x', cause: 'y' })).status).toBe(403)

    const r = await quality.post('/api/corrective-actions', {
      nonconformityId: nc.body.id,
      title: 'Enter readings at the bench',
      cause: 'Readings were written on paper and typed in later.',
      items: [
        { description: 'Put a terminal at the bench', ownerId: techId, dueDate: addDays(today, -1) },
        { description: 'Retire the paper worksheet', ownerId: qualityId, dueDate: addDays(today, 30) },
      ],
      effectivenessDueOn: addDays(today, 60),
    })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    expect(r.body).toMatchObject({ status: 'open', nonconformityNumber: nc.body.number, overdue: true, awaitingEffectiveness: false })
    expect(r.body.items.map((i: { overdue: boolean }) => i.overdue)).toEqual([true, false])
    action = r.body
  })

  it('an overdue action is on the overview and in the daily mail to quality managers', async () => {
    const o = (await quality.get('/api/quality/overview')).body
    const listed = o.overdueActions.find((a: { id: number }) => a.id === action.id)
    expect(listed).toMatchObject({ number: action.number, link: `/quality/actions/${action.id}` })
    expect((await quality.get('/api/corrective-actions?overdue=true&pageSize=200')).body.rows.map((a: { id: number }) => a.id)).toContain(action.id)
    const preview = (await admin.get('/api/admin/mail/reminders/preview')).body
    const alert = preview.messages.find((m: { kind: string, to: string[] }) => m.kind === 'quality-alert' && m.to.includes('quality@bandlight.test'))
    expect(alert, 'a quality alert for the demo quality manager').toBeTruthy()
    expect(alert.items.some((i: { label: string, itemType: string, milestone: string }) => i.label === action.number && i.itemType === 'action' && i.milestone === 'overdue')).toBe(true)
  })

  it('cannot close before its effectiveness check is recorded (409); the check needs every action done (409)', async () => {
    const close = await quality.post(`/api/corrective-actions/${action.id}/close`, { version: action.version })
    expect(close.status).toBe(409)
    expect(close.body.data.fields).toHaveProperty('effective')
    expect(close.body.message).toMatch(/cannot close before its effectiveness check is recorded/)
    const early = await quality.post(`/api/corrective-actions/${action.id}/effectiveness`, { effective: true, check: 'Looked fine', version: action.version })
    expect(early.status).toBe(409)
  })

  it('only the owner or a quality manager marks an action done (403 otherwise)', async () => {
    const theirs = action.items.find(i => i.ownerId === qualityId)!
    const mine = action.items.find(i => i.ownerId === techId)!
    expect((await tech.post(`/api/corrective-actions/${action.id}/items/${theirs.id}/done`, {})).status).toBe(403)
    const done = await tech.post(`/api/corrective-actions/${action.id}/items/${mine.id}/done`, { note: 'Terminal installed' })
    expect(done.status, JSON.stringify(done.body)).toBe(200)
    expect(done.body.overdue).toBe(false)
    expect((await tech.post(`/api/corrective-actions/${action.id}/items/${mine.id}/done`, {})).status).toBe(409)
    const future = await quality.post(`/api/corrective-actions/${action.id}/items/${theirs.id}/done`, { doneOn: addDays(today, 1) })
    expect(future.status).toBe(400)
    expect(future.body.data.fields).toHaveProperty('doneOn')
    const all = await quality.post(`/api/corrective-actions/${action.id}/items/${theirs.id}/done`, {})
    expect(all.status).toBe(200)
    expect(all.body.awaitingEffectiveness).toBe(true)
    action = all.body
  })

  it('found not effective it stays open; a further action resets the check; found effective it closes', async () => {
    const no = await quality.post(`/api/corrective-actions/${action.id}/effectiveness`, { effective: false, check: 'Two transcription slips in the next month', version: action.version })
    expect(no.status, JSON.stringify(no.body)).toBe(200)
    const refused = await quality.post(`/api/corrective-actions/${action.id}/close`, { version: no.body.version })
    expect(refused.status).toBe(409)
    expect(refused.body.message).toMatch(/not effective/)
    const more = await quality.post(`/api/corrective-actions/${action.id}/items`, { description: 'Scan readings from the instrument', ownerId: techId, dueDate: today, version: no.body.version })
    expect(more.status, JSON.stringify(more.body)).toBe(201)
    expect(more.body).toMatchObject({ effective: null, effectivenessCheck: null, awaitingEffectiveness: false })
    expect((await quality.post(`/api/corrective-actions/${action.id}/close`, { version: more.body.version })).status).toBe(409)
    const item = more.body.items.find((i: { doneOn: string | null }) => !i.doneOn)
    await tech.post(`/api/corrective-actions/${action.id}/items/${item.id}/done`, {})
    const now = (await quality.get(`/api/corrective-actions/${action.id}`)).body
    const yes = await quality.post(`/api/corrective-actions/${action.id}/effectiveness`, { effective: true, check: 'No slip in two months of records', version: now.version })
    expect(yes.status).toBe(200)
    const closed = await quality.post(`/api/corrective-actions/${action.id}/close`, { version: yes.body.version })
    expect(closed.status, JSON.stringify(closed.body)).toBe(200)
    expect(closed.body).toMatchObject({ status: 'closed', effective: true, closedByName: 'Quinn Halvorsen' })
    expect(closed.body.audit.map((a: { action: string }) => a.action)).toEqual(expect.arrayContaining(['create', 'effectiveness-check', 'add-action', 'close']))
    expect((await quality.post(`/api/corrective-actions/${action.id}/close`, { version: closed.body.version })).status).toBe(409)
  })

  it('the demo’s corrective action has its actions done and waits for its effectiveness check', async () => {
    const demo = (await quality.get('/api/corrective-actions?status=open&pageSize=200')).body.rows.find((a: { title: string }) => a.title === 'BB-CV-02 control thermocouple connector')
    expect(demo).toMatchObject({ awaitingEffectiveness: true, effectivenessDueOn: '2027-01-31', overdue: false })
    expect(demo.nonconformityNumber).toMatch(/^NC-2026-\d{3}$/)
    const o = (await quality.get('/api/quality/overview')).body
    expect(o.actionsAwaitingEffectiveness.map((a: { id: number }) => a.id)).toContain(demo.id)
  })
})
