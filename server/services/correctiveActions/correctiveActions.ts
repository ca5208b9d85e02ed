/**
 * Corrective actions (ISO/IEC 17025:2017 8.7): linked to a nonconformity or a complaint; the cause
 * found; actions with owners and due dates; an effectiveness check that must be recorded — and
 * found effective — before the action can close (409 otherwise). An action is overdue when it is
 * not done after its due date (lab-local today); the overview and the daily mail list those.
 */
import { Op, type Transaction } from 'sequelize'
import { LAB_ROLES } from '#shared/roles'
import type { ActionItemCreateInput, ActionItemDoneInput, CorrectiveActionCloseInput, CorrectiveActionCreateInput, CorrectiveActionQuery, CorrectiveActionUpdateInput, EffectivenessInput } from '#shared/schemas/correctiveAction'
import type { CorrectiveActionDTO, CorrectiveActionDetailDTO, Page, SessionUser } from '#shared/types'
import { Complaint } from '#server/models/Complaint'
import { CorrectiveAction } from '#server/models/CorrectiveAction'
import { CorrectiveActionItem } from '#server/models/CorrectiveActionItem'
import { Nonconformity } from '#server/models/Nonconformity'
import { User } from '#server/models/User'
import { createAudited, updateAudited } from '#server/utils/audit'
import { assertVersion, conflict, forbidden, invalidInput, notFound } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'
import { auditTrail } from '#server/services/audit/trail'
import { labToday } from '#server/services/settings/today'
import { iso, nextRecordNumber, userNames } from '#server/services/quality/records'
import { readTogether } from '#server/utils/db'

/** Corrective actions as the API returns them, with their items, links and names. */
export async function correctiveActionDTOs(rows: CorrectiveAction[], today?: string, t?: Transaction): Promise<CorrectiveActionDTO[]> {
  if (!rows.length) return []
  const day = today ?? await labToday(new Date(), t)
  const items = await CorrectiveActionItem.findAll({ where: { correctiveActionId: rows.map(r => r.id) }, order: [['dueDate', 'ASC'], ['id', 'ASC']], transaction: t })
  const ncIds = rows.map(r => r.nonconformityId).filter((v): v is number => !!v)
  const cpIds = rows.map(r => r.complaintId).filter((v): v is number => !!v)
  const [ncs, cps, names] = await readTogether(t, [
    () => ncIds.length ? Nonconformity.findAll({ where: { id: ncIds }, attributes: ['id', 'number'], transaction: t }) : [],
    () => cpIds.length ? Complaint.findAll({ where: { id: cpIds }, attributes: ['id', 'number'], transaction: t }) : [],
    () => userNames([...rows.flatMap(r => [r.openedBy, r.effectivenessCheckedBy, r.closedBy]), ...items.flatMap(i => [i.ownerId, i.doneBy])], t),
  ])
  const ncNumber = new Map(ncs.map(n => [n.id, n.number]))
  const cpNumber = new Map(cps.map(c => [c.id, c.number]))
  return rows.map((r) => {
    const mine = items.filter(i => i.correctiveActionId === r.id).map(i => ({
      id: i.id,
      description: i.description,
      ownerId: i.ownerId,
      ownerName: names.get(i.ownerId) ?? null,
      dueDate: i.dueDate,
      doneOn: i.doneOn ?? null,
      doneByName: i.doneBy ? names.get(i.doneBy) ?? null : null,
      doneNote: i.doneNote ?? null,
      overdue: r.status === 'open' && !i.doneOn && i.dueDate < day,
    }))
    return {
      id: r.id,
      number: r.number,
      nonconformityId: r.nonconformityId ?? null,
      nonconformityNumber: r.nonconformityId ? ncNumber.get(r.nonconformityId) ?? null : null,
      complaintId: r.complaintId ?? null,
      complaintNumber: r.complaintId ? cpNumber.get(r.complaintId) ?? null : null,
      title: r.title,
      cause: r.cause,
      openedOn: r.openedOn,
      openedByName: names.get(r.openedBy) ?? null,
      items: mine,
      effectivenessDueOn: r.effectivenessDueOn ?? null,
      effectivenessCheck: r.effectivenessCheck ?? null,
      effective: r.effective ?? null,
      effectivenessCheckedByName: r.effectivenessCheckedBy ? names.get(r.effectivenessCheckedBy) ?? null : null,
      effectivenessCheckedAt: iso(r.effectivenessCheckedAt),
      awaitingEffectiveness: r.status === 'open' && mine.length > 0 && mine.every(i => i.doneOn) && r.effective === null,
      overdue: mine.some(i => i.overdue),
      status: r.status,
      closedAt: iso(r.closedAt),
      closedByName: r.closedBy ? names.get(r.closedBy) ?? null : null,
      version: r.version,
      createdAt: r.createdAt.toISOString(),
      updatedAt: r.updatedAt.toISOString(),
    }
  })
}

/** Open corrective actions with an action past its due date (lab-local `today`). */
export async function overdueCorrectiveActions(today: string, t?: Transaction): Promise<CorrectiveAction[]> {
  const late = await CorrectiveActionItem.findAll({ where: { doneOn: null, dueDate: { [Op.lt]: today } }, attributes: ['correctiveActionId'], transaction: t })
  const ids = [...new Set(late.map(i => i.correctiveActionId))]
  return ids.length ? CorrectiveAction.findAll({ where: { id: ids, status: 'open' }, order: [['openedOn', 'ASC'], ['id', 'ASC']], transaction: t }) : []
}

export async function listCorrectiveActions(q: CorrectiveActionQuery): Promise<Page<CorrectiveActionDTO>> {
  const today = await labToday()
  const where: Record<string, unknown> = {}
  if (q.status) where.status = q.status
  if (q.overdue === 'true') where.id = (await overdueCorrectiveActions(today)).map(r => r.id)
  const { rows, count } = await CorrectiveAction.findAndCountAll({ where, order: [['openedOn', 'DESC'], ['id', 'DESC']], limit: q.pageSize, offset: (q.page - 1) * q.pageSize })
  return { rows: await correctiveActionDTOs(rows, today), total: count, page: q.page, pageSize: q.pageSize }
}

export async function correctiveActionDetail(id: number): Promise<CorrectiveActionDetailDTO> {
  const row = await CorrectiveAction.findByPk(id)
  if (!row) notFound('corrective action')
  const [dto] = await correctiveActionDTOs([row])
  return { ...dto!, audit: await auditTrail('CorrectiveAction', id) }
}

/** 400 naming the field unless each owner is an active laboratory user. */
async function assertOwners(t: Transaction, ownerIds: { field: string, id: number }[]): Promise<void> {
  if (!ownerIds.length) return
  const users = await User.findAll({ where: { id: ownerIds.map(o => o.id) }, attributes: ['id', 'role', 'active'], transaction: t })
  const ok = new Set(users.filter(u => u.active && (LAB_ROLES as readonly string[]).includes(u.role)).map(u => u.id))
  const bad = ownerIds.filter(o => !ok.has(o.id))
  if (bad.length) invalidInput(Object.fromEntries(bad.map(o => [o.field, 'The owner must be an active member of the laboratory staff'])))
}

async function addItemIn(t: Transaction, actor: { id: number }, actionId: number, item: { description: string, ownerId: number, dueDate: string }): Promise<CorrectiveActionItem> {
  return createAudited(t, actor, CorrectiveActionItem, { correctiveActionId: actionId, description: item.description, ownerId: item.ownerId, dueDate: item.dueDate, doneOn: null, doneBy: null, doneNote: null }, { entity: 'CorrectiveActionItem' })
}

/** Open a corrective action, in the caller's transaction (the demo seed passes its own). */
export async function openCorrectiveActionIn(t: Transaction, actor: { id: number }, input: CorrectiveActionCreateInput, openedOn?: string): Promise<CorrectiveAction> {
  if (input.nonconformityId && !(await Nonconformity.findByPk(input.nonconformityId, { transaction: t }))) invalidInput({ nonconformityId: 'No nonconformity with this id' })
  if (input.complaintId && !(await Complaint.findByPk(input.complaintId, { transaction: t }))) invalidInput({ complaintId: 'No complaint with this id' })
  await assertOwners(t, input.items.map((i, n) => ({ field: `items[${n}].ownerId`, id: i.ownerId })))
  const day = openedOn ?? await labToday(new Date(), t)
  const number = await nextRecordNumber(t, CorrectiveAction, 'CA', day)
  const row = await createAudited(t, actor, CorrectiveAction, {
    number, nonconformityId: input.nonconformityId, complaintId: input.complaintId, title: input.title, cause: input.cause,
    openedOn: day, openedBy: actor.id, effectivenessDueOn: input.effectivenessDueOn,
    effectivenessCheck: null, effective: null, effectivenessCheckedBy: null, effectivenessCheckedAt: null, closedAt: null, closedBy: null,
  }, { entity: 'CorrectiveAction' })
  for (const item of input.items) await addItemIn(t, actor, row.id, item)
  return row
}

async function openAction(t: Transaction, id: number): Promise<CorrectiveAction> {
  const row = await CorrectiveAction.findByPk(id, { transaction: t })
  if (!row) notFound('corrective action')
  if (row.status === 'closed') conflict(`Corrective action ${row.number} is closed`)
  return row
}

export async function openCorrectiveAction(user: SessionUser, input: CorrectiveActionCreateInput): Promise<CorrectiveActionDetailDTO> {
  const row = await inTransaction(t => openCorrectiveActionIn(t, user, input))
  return correctiveActionDetail(row.id)
}

export async function updateCorrectiveAction(user: SessionUser, id: number, input: CorrectiveActionUpdateInput): Promise<CorrectiveActionDetailDTO> {
  await inTransaction(async (t) => {
    const row = await openAction(t, id)
    assertVersion(row.version, input.version)
    const { version: _v, ...changes } = input
    await updateAudited(t, user, row, changes, { entity: 'CorrectiveAction' })
  })
  return correctiveActionDetail(id)
}

/** A further action; a recorded effectiveness check no longer stands (the new action needs its own). */
export async function addActionItem(user: SessionUser, id: number, input: ActionItemCreateInput): Promise<CorrectiveActionDetailDTO> {
  await inTransaction(async (t) => {
    const row = await openAction(t, id)
    assertVersion(row.version, input.version)
    await assertOwners(t, [{ field: 'ownerId', id: input.ownerId }])
    await addItemIn(t, user, row.id, input)
    const reset = await updateAudited(t, user, row, { effective: null, effectivenessCheck: null, effectivenessCheckedBy: null, effectivenessCheckedAt: null }, { entity: 'CorrectiveAction', action: 'add-action' })
    if (!reset) {
      // The action changed (a new item): its version moves on, so stale copies get 409.
      row.changed('updatedAt', true)
      await row.save({ transaction: t })
    }
  })
  return correctiveActionDetail(id)
}

/** Mark one action done: its owner, or a quality manager or administrator (403 otherwise). */
export async function markActionItemDoneIn(t: Transaction, user: Pick<SessionUser, 'id' | 'role'>, id: number, itemId: number, input: ActionItemDoneInput): Promise<void> {
  const row = await openAction(t, id)
  const item = await CorrectiveActionItem.findOne({ where: { id: itemId, correctiveActionId: row.id }, transaction: t })
  if (!item) notFound('action')
  if (item.ownerId !== user.id && user.role !== 'quality' && user.role !== 'admin') forbidden('Only the owner of this action, a quality manager or an administrator can mark it done')
  if (item.doneOn) conflict(`This action was marked done on ${item.doneOn}`)
  const today = await labToday(new Date(), t)
  const doneOn = input.doneOn ?? today
  if (doneOn > today) invalidInput({ doneOn: 'An action cannot be done on a date still to come' })
  await updateAudited(t, { id: user.id }, item, { doneOn, doneBy: user.id, doneNote: input.note }, { entity: 'CorrectiveActionItem', action: 'done' })
}

export async function markActionItemDone(user: SessionUser, id: number, itemId: number, input: ActionItemDoneInput): Promise<CorrectiveActionDetailDTO> {
  await inTransaction(t => markActionItemDoneIn(t, user, id, itemId, input))
  return correctiveActionDetail(id)
}

/** Record the effectiveness check: every action must be done first (409). */
export async function recordEffectivenessIn(t: Transaction, user: { id: number }, id: number, input: EffectivenessInput): Promise<void> {
  const row = await openAction(t, id)
  assertVersion(row.version, input.version)
  const open = await CorrectiveActionItem.count({ where: { correctiveActionId: row.id, doneOn: null }, transaction: t })
  if (open) conflict(`${open} action(s) of ${row.number} are not done yet: check effectiveness once every action is done`, 'effective')
  if (!(await CorrectiveActionItem.count({ where: { correctiveActionId: row.id }, transaction: t }))) conflict(`${row.number} has no actions yet: add the actions taken first`, 'effective')
  await updateAudited(t, user, row, { effective: input.effective, effectivenessCheck: input.check, effectivenessCheckedBy: user.id, effectivenessCheckedAt: new Date() }, { entity: 'CorrectiveAction', action: 'effectiveness-check' })
}

export async function recordEffectiveness(user: SessionUser, id: number, input: EffectivenessInput): Promise<CorrectiveActionDetailDTO> {
  await inTransaction(t => recordEffectivenessIn(t, user, id, input))
  return correctiveActionDetail(id)
}

/** Close: 409 until the effectiveness check is recorded and found the action effective. */
export async function closeCorrectiveAction(user: SessionUser, id: number, input: CorrectiveActionCloseInput): Promise<CorrectiveActionDetailDTO> {
  await inTransaction(async (t) => {
    const row = await openAction(t, id)
    assertVersion(row.version, input.version)
    if (row.effective === null) conflict(`${row.number} cannot close before its effectiveness check is recorded`, 'effective')
    if (row.effective === false) conflict(`The effectiveness check of ${row.number} found it not effective: add further actions and check again before closing`, 'effective')
    const open = await CorrectiveActionItem.count({ where: { correctiveActionId: row.id, doneOn: null }, transaction: t })
    if (open) conflict(`${open} action(s) of ${row.number} are not done yet`, 'items')
    await updateAudited(t, user, row, { status: 'closed', closedAt: new Date(), closedBy: user.id }, { entity: 'CorrectiveAction', action: 'close' })
  })
  return correctiveActionDetail(id)
}
