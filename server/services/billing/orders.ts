/**
 * Orders: made when a customer accepts a quote. Where an order stands is read from the records of
 * its request's runs — the receipt record, the first point entered, the submission for review, the
 * certificate — and the return the laboratory records here with the carrier's tracking reference
 * (shared/billing/orderProgress.ts). The customer is written to when an instrument is received and
 * when the order goes back. Customers see only their organization's orders (404 otherwise).
 */
import { Op, type Transaction } from 'sequelize'
import type { InstrumentWork } from '#shared/billing/lines'
import { orderProgress, type OrderItemFacts } from '#shared/billing/orderProgress'
import { labLocalDate } from '#shared/mail/milestones'
import type { OrderQuery, OrderReturnInput } from '#shared/schemas/billing'
import type { Page, SessionUser } from '#shared/types'
import type { OrderDTO } from '#shared/types/billing'
import { CalibrationRequest } from '#server/models/CalibrationRequest'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { Certificate } from '#server/models/Certificate'
import { Instrument } from '#server/models/Instrument'
import { Invoice } from '#server/models/Invoice'
import { ItemReceipt } from '#server/models/ItemReceipt'
import { Order } from '#server/models/Order'
import { Organization } from '#server/models/Organization'
import { Quote } from '#server/models/Quote'
import { RunPoint } from '#server/models/RunPoint'
import { User } from '#server/models/User'
import { organizationScope } from '#server/utils/access'
import { updateAudited } from '#server/utils/audit'
import { assertVersion, conflict, invalidInput, notFound } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'
import { labTimeZone, labToday } from '#server/services/settings/today'
import { notifyItemReceived, notifyOrderReturned } from './mail'
import { readTogether } from '#server/utils/db'

/** What the records say about one instrument of an order. */
export interface OrderItemWork extends OrderItemFacts {
  instrumentId: number
  serial: string
  label: string
  runId: number | null
  /** The certificate shown for it: the valid revision, else the latest. */
  certificate: { id: number, number: string, status: string } | null
  /** What billing needs to know (shared/billing/lines.ts). */
  work: InstrumentWork
}

/**
 * The work of each instrument of an order, in the request's order of instruments: its run (the
 * latest of the request that is not void and not a correction), receipt, first point, submission
 * and certificate — the valid revision of the run's certificate number, or the state it was left in.
 */
export async function orderWorkIn(t: Transaction | undefined, order: Order): Promise<OrderItemWork[]> {
  const r = await CalibrationRequest.findByPk(order.requestId, { attributes: ['instrumentIds'], transaction: t })
  const instrumentIds = r?.instrumentIds ?? []
  const [instruments, runs] = await readTogether(t, [
    () => Instrument.findAll({ where: { id: instrumentIds }, attributes: ['id', 'serial', 'maker', 'model'], transaction: t }),
    () => CalibrationRun.findAll({ where: { requestId: order.requestId, revisionOf: null }, order: [['id', 'ASC']], transaction: t }),
  ])
  const runOf = new Map<number, CalibrationRun>()
  for (const run of runs) {
    const had = runOf.get(run.instrumentId)
    if (!had || had.status === 'void' || run.status !== 'void') runOf.set(run.instrumentId, run)
  }
  const runIds = [...runOf.values()].map(x => x.id)
  const [receipts, points, firsts] = runIds.length
    ? await readTogether(t, [
        () => ItemReceipt.findAll({ where: { runId: runIds }, transaction: t }),
        () => RunPoint.findAll({ where: { runId: runIds }, attributes: ['runId', 'createdAt'], transaction: t }),
        () => Certificate.findAll({ where: { runId: runIds, revision: 0 }, attributes: ['id', 'runId', 'baseNumber', 'issueDate'], transaction: t }),
      ])
    : [[] as ItemReceipt[], [] as RunPoint[], [] as Certificate[]]
  const revisions = firsts.length
    ? await Certificate.findAll({ where: { baseNumber: firsts.map(c => c.baseNumber) }, attributes: ['id', 'number', 'baseNumber', 'revision', 'status', 'runId'], order: [['revision', 'ASC']], transaction: t })
    : []
  const validRunIds = revisions.filter(c => c.status === 'valid').map(c => c.runId)
  const certifiedPoints = new Map<number, Set<string>>()
  if (validRunIds.length) {
    for (const p of await RunPoint.findAll({ where: { runId: validRunIds, voidedAt: null }, attributes: ['runId', 'setPointK'], transaction: t })) {
      const set = certifiedPoints.get(p.runId) ?? new Set<string>()
      set.add(p.setPointK.toFixed(2))
      certifiedPoints.set(p.runId, set)
    }
  }
  const tz = await labTimeZone(t)
  const local = (d: Date | null | undefined) => (d ? labLocalDate(d, tz) : null)
  const receiptOf = new Map(receipts.map(x => [x.runId, x]))
  const firstPoint = new Map<number, Date>()
  for (const p of points) {
    const had = firstPoint.get(p.runId)
    if (!had || p.createdAt < had) firstPoint.set(p.runId, p.createdAt)
  }
  const byId = new Map(instruments.map(i => [i.id, i]))
  return instrumentIds.map((id) => {
    const inst = byId.get(id)
    const run = runOf.get(id) ?? null
    const first = run ? firsts.find(c => c.runId === run.id) ?? null : null
    const chain = first ? revisions.filter(c => c.baseNumber === first.baseNumber) : []
    const valid = chain.find(c => c.status === 'valid') ?? null
    const shown = valid ?? chain[chain.length - 1] ?? null
    const state: InstrumentWork['certificate'] = valid ? 'valid' : shown?.status === 'withdrawn' ? 'withdrawn' : 'none'
    const submitted = run && (run.status === 'submitted' || run.status === 'approved') ? local(run.submittedAt) : null
    return {
      instrumentId: id,
      serial: inst?.serial ?? String(id),
      label: inst ? `${inst.maker} ${inst.model}` : '',
      runId: run?.id ?? null,
      receivedOn: run ? receiptOf.get(run.id)?.receivedOn ?? null : null,
      firstPointOn: run ? local(firstPoint.get(run.id)) : null,
      submittedOn: submitted ?? (first ? first.issueDate : null),
      certifiedOn: first?.issueDate ?? null,
      certificate: shown ? { id: shown.id, number: shown.number, status: shown.status } : null,
      work: { certificate: state, certifiedPoints: valid ? certifiedPoints.get(valid.runId)?.size ?? 0 : null },
    }
  })
}

/** The instrument facts billing needs, by instrument id. */
export function workByInstrument(items: readonly OrderItemWork[]): Map<number, InstrumentWork> {
  return new Map(items.map(i => [i.instrumentId, i.work]))
}

async function toDTO(user: SessionUser, o: Order): Promise<OrderDTO> {
  const [items, org, quote, invoice, placedBy] = await Promise.all([
    orderWorkIn(undefined, o),
    Organization.findByPk(o.organizationId, { attributes: ['name'] }),
    Quote.findByPk(o.quoteId, { attributes: ['number', 'currency', 'grossMinor'] }),
    Invoice.findOne({ where: { orderId: o.id }, attributes: ['id', 'number', 'status'] }),
    User.findByPk(o.placedBy, { attributes: ['name'] }),
  ])
  const progress = orderProgress(items, o.returnedOn ?? null)
  const lab = user.role !== 'customer'
  return {
    id: o.id,
    number: o.number,
    organizationId: o.organizationId,
    organizationName: org?.name ?? null,
    requestId: o.requestId,
    quoteId: o.quoteId,
    quoteNumber: quote?.number ?? '',
    purchaseOrder: o.purchaseOrder,
    placedAt: o.placedAt.toISOString(),
    placedByName: placedBy?.name ?? null,
    stage: progress.stage,
    steps: progress.steps,
    items: items.map(i => ({ instrumentId: i.instrumentId, serial: i.serial, label: i.label, runId: lab ? i.runId : null, receivedOn: i.receivedOn, certificate: i.certificate })),
    returnedOn: o.returnedOn ?? null,
    carrier: o.carrier ?? null,
    trackingReference: o.trackingReference ?? null,
    invoice: invoice ? { id: invoice.id, number: invoice.number, status: invoice.status } : null,
    currency: quote?.currency ?? '',
    grossMinor: quote?.grossMinor ?? 0,
    version: o.version,
  }
}

/** One order, or 404 when it does not exist or belongs to another organization. */
export async function findOrder(user: SessionUser, id: number, t?: Transaction): Promise<Order> {
  const o = await Order.findOne({ where: { id, ...organizationScope(user) }, transaction: t, lock: t ? t.LOCK.UPDATE : undefined })
  if (!o) notFound('order')
  return o
}

export async function listOrders(user: SessionUser, q: OrderQuery): Promise<Page<OrderDTO>> {
  const where = { ...organizationScope(user), ...(q.q ? { [Op.or]: [{ number: { [Op.like]: `${q.q.replace(/[\\%_]/g, c => `\\${c}`)}%` } }, { purchaseOrder: { [Op.like]: `${q.q.replace(/[\\%_]/g, c => `\\${c}`)}%` } }] } : {}) }
  const { rows, count } = await Order.findAndCountAll({ where, order: [['placedAt', 'DESC'], ['id', 'DESC']], limit: q.pageSize, offset: (q.page - 1) * q.pageSize })
  const out: OrderDTO[] = []
  for (const o of rows) out.push(await toDTO(user, o))
  return { rows: out, total: count, page: q.page, pageSize: q.pageSize }
}

export async function orderDetail(user: SessionUser, id: number): Promise<OrderDTO> {
  return toDTO(user, await findOrder(user, id))
}

/** The laboratory records that the order's instruments went back, with the carrier's tracking reference; the customer is told. */
export async function recordReturnIn(t: Transaction, user: SessionUser, id: number, input: OrderReturnInput): Promise<Order> {
  const o = await findOrder(user, id, t)
  assertVersion(o.version, input.version)
  const items = await orderWorkIn(t, o)
  const received = items.map(i => i.receivedOn).filter((d): d is string => d !== null)
  if (!received.length) conflict('No instrument of this order has been received yet: record its receipt on its run first', 'returnedOn')
  const today = await labToday(new Date(), t)
  if (input.returnedOn > today) invalidInput({ returnedOn: 'The return date cannot be in the future' })
  const first = received.reduce((a, b) => (a < b ? a : b))
  if (input.returnedOn < first) invalidInput({ returnedOn: `The instruments cannot go back before they were received (${first})` })
  await updateAudited(t, user, o, { returnedOn: input.returnedOn, carrier: input.carrier ?? null, trackingReference: input.trackingReference, returnedBy: user.id }, { entity: 'Order', action: 'return' })
  await notifyOrderReturned(t, o)
  return o
}

export async function recordReturn(user: SessionUser, id: number, input: OrderReturnInput): Promise<OrderDTO> {
  await inTransaction(t => recordReturnIn(t, user, id, input))
  return orderDetail(user, id)
}

/**
 * Called in the transaction that records an item's receipt (server/services/runs/receipt.ts): when
 * the run belongs to an order, the customer hears that the instrument arrived (once per instrument).
 */
export async function onItemReceivedIn(t: Transaction, run: CalibrationRun, receipt: ItemReceipt): Promise<void> {
  if (!run.requestId || run.revisionOf) return
  const order = await Order.findOne({ where: { requestId: run.requestId }, transaction: t })
  if (!order) return
  const inst = await Instrument.findByPk(run.instrumentId, { attributes: ['serial'], transaction: t })
  await notifyItemReceived(t, order, inst?.serial ?? String(run.instrumentId), receipt.receivedOn, run.instrumentId)
}
