/**
 * Quotes for reviewed calibration requests. The laboratory makes a draft from the price list (one
 * calibration line per instrument with the points the price includes, the points beyond them, an
 * on-site line when the terms say so), edits its lines, and sends it (the PDF is drawn and kept,
 * the customer told). The customer accepts it in the portal with its purchase-order number — which
 * agrees to the request's terms the quote prices, if not yet agreed, and makes the order — or
 * declines it. A new quote for the same request supersedes a draft or sent one; a quote priced on
 * terms since revised can be neither sent nor accepted. Customers see only their organization's
 * quotes, and never a draft (404).
 */
import { Op, type Transaction, type WhereOptions } from 'sequelize'
import { quoteLinesFrom } from '#shared/billing/lines'
import { basisPointsToPercent, MAX_DOCUMENT_MINOR, totalsOf } from '#shared/billing/money'
import { addDays } from '#shared/mail/milestones'
import type { QuoteAcceptInput, QuoteCreateInput, QuoteDeclineInput, QuoteQuery, QuoteUpdateInput } from '#shared/schemas/billing'
import type { Page, SessionUser } from '#shared/types'
import type { QuoteDTO } from '#shared/types/billing'
import { CalibrationRequest } from '#server/models/CalibrationRequest'
import { Instrument } from '#server/models/Instrument'
import { Order } from '#server/models/Order'
import { Organization } from '#server/models/Organization'
import { PriceList } from '#server/models/PriceList'
import { ProcedureVersion } from '#server/models/ProcedureVersion'
import { Quote } from '#server/models/Quote'
import { User } from '#server/models/User'
import { organizationScope } from '#server/utils/access'
import { createAudited, updateAudited } from '#server/utils/audit'
import { assertVersion, conflict, invalidInput, notFound } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'
import { labToday } from '#server/services/settings/today'
import type { StoredFile } from '#server/services/uploads/uploads'
import { allocateNumberIn } from './counters'
import { linesDTO, quotePdf, storePdf } from './documents'
import { notifyQuoteSent } from './mail'
import { requirePriceList } from './prices'

const instrumentLabel = (i: { maker: string, model: string, serial: string }) => `${i.maker} ${i.model}, serial ${i.serial}`

async function toDTOs(user: SessionUser, rows: Quote[]): Promise<QuoteDTO[]> {
  if (!rows.length) return []
  const requests = new Map((await CalibrationRequest.findAll({ where: { id: [...new Set(rows.map(r => r.requestId))] } })).map(r => [r.id, r]))
  const instrumentIds = [...new Set([...requests.values()].flatMap(r => r.instrumentIds))]
  const userIds = [...new Set(rows.map(r => r.respondedBy).filter((v): v is number => v !== null))]
  const [instruments, orgs, users, orders, lists] = await Promise.all([
    instrumentIds.length ? Instrument.findAll({ where: { id: instrumentIds }, attributes: ['id', 'serial', 'maker', 'model'] }) : [],
    Organization.findAll({ where: { id: [...new Set(rows.map(r => r.organizationId))] }, attributes: ['id', 'name'] }),
    userIds.length ? User.findAll({ where: { id: userIds }, attributes: ['id', 'name'] }) : [],
    Order.findAll({ where: { quoteId: rows.map(r => r.id) }, attributes: ['id', 'quoteId'] }),
    user.role === 'customer' ? [] : PriceList.findAll({ where: { id: [...new Set(rows.map(r => r.priceListId).filter((v): v is number => v !== null))] } }),
  ])
  const inst = new Map(instruments.map(i => [i.id, { id: i.id, serial: i.serial, maker: i.maker, model: i.model }]))
  const orgName = new Map(orgs.map(o => [o.id, o.name]))
  const names = new Map(users.map(u => [u.id, u.name]))
  const orderOf = new Map(orders.map(o => [o.quoteId, o.id]))
  const listOf = new Map(lists.map(l => [l.id, l]))
  return rows.map((q) => {
    const r = requests.get(q.requestId)
    return {
      id: q.id,
      number: q.number,
      requestId: q.requestId,
      organizationId: q.organizationId,
      organizationName: orgName.get(q.organizationId) ?? null,
      status: q.status,
      termsCurrent: !!r && r.termsVersion === q.termsVersion,
      procedureName: r?.terms ? `${r.terms.procedureName} (version ${r.terms.procedureVersionNumber})` : null,
      pointsCount: r?.terms?.pointsK.length ?? 0,
      placeOfCalibration: r?.terms?.placeOfCalibration ?? null,
      instruments: (r?.instrumentIds ?? []).map(id => inst.get(id)).filter((v): v is NonNullable<typeof v> => !!v),
      currency: q.currency,
      taxRatePercent: basisPointsToPercent(q.taxRateBp),
      lines: linesDTO(q.lines),
      netMinor: q.netMinor,
      taxMinor: q.taxMinor,
      grossMinor: q.grossMinor,
      message: q.message ?? null,
      validUntil: q.validUntil ?? null,
      sentAt: q.sentAt ? q.sentAt.toISOString() : null,
      respondedAt: q.respondedAt ? q.respondedAt.toISOString() : null,
      respondedByName: q.respondedBy ? names.get(q.respondedBy) ?? null : null,
      purchaseOrder: q.purchaseOrder ?? null,
      declineReason: q.declineReason ?? null,
      orderId: orderOf.get(q.id) ?? null,
      extras: q.priceListId ? listOf.get(q.priceListId)?.extras ?? null : null,
      version: q.version,
      createdAt: q.createdAt.toISOString(),
    }
  })
}

/** What a user may see: a customer its organization's quotes that were sent, never a draft. */
function visible(user: SessionUser): WhereOptions {
  return user.role === 'customer' ? { ...organizationScope(user), status: { [Op.ne]: 'draft' } } : {}
}

/** One quote, or 404 when it does not exist or the user may not see it. */
export async function findQuote(user: SessionUser, id: number, t?: Transaction): Promise<Quote> {
  const q = await Quote.findOne({ where: { id, ...visible(user) }, transaction: t, lock: t ? t.LOCK.UPDATE : undefined })
  if (!q) notFound('quote')
  return q
}

export async function listQuotes(user: SessionUser, q: QuoteQuery): Promise<Page<QuoteDTO>> {
  const where: WhereOptions = { ...visible(user), ...(q.requestId ? { requestId: q.requestId } : {}) }
  if (q.status) Object.assign(where, user.role === 'customer' && q.status === 'draft' ? { id: -1 } : { status: q.status })
  const { rows, count } = await Quote.findAndCountAll({ where, order: [['createdAt', 'DESC'], ['id', 'DESC']], limit: q.pageSize, offset: (q.page - 1) * q.pageSize })
  return { rows: await toDTOs(user, rows), total: count, page: q.page, pageSize: q.pageSize }
}

export async function quoteDetail(user: SessionUser, id: number): Promise<QuoteDTO> {
  return (await toDTOs(user, [await findQuote(user, id)]))[0]!
}

function assertTotals(lines: readonly { quantity: number, unitPriceMinor: number }[], rateBp: number) {
  const totals = totalsOf(lines, rateBp)
  if (totals.grossMinor > MAX_DOCUMENT_MINOR) invalidInput({ lines: 'The total is too large for one quote' })
  return totals
}

/** A draft quote for a reviewed request, its lines from the current price list; earlier drafts and sent quotes are superseded. */
export async function createQuoteIn(t: Transaction, user: SessionUser, input: QuoteCreateInput): Promise<Quote> {
  const r = await CalibrationRequest.findByPk(input.requestId, { transaction: t, lock: t.LOCK.UPDATE })
  if (!r) invalidInput({ requestId: 'No calibration request with this id' })
  if (r.status === 'declined') conflict('The request was declined: nothing to quote', 'requestId')
  if (!r.terms) conflict('Review the request and offer terms first: a quote prices the terms', 'requestId')
  const accepted = await Quote.findOne({ where: { requestId: r.id, status: 'accepted' }, transaction: t })
  if (accepted) conflict(`Quote ${accepted.number} was accepted: the order is placed`, 'requestId')
  const list = await requirePriceList(t)
  const pv = await ProcedureVersion.findByPk(r.terms.procedureVersionId, { attributes: ['id', 'procedureId'], transaction: t })
  const instruments = await Instrument.findAll({ where: { id: r.instrumentIds }, transaction: t })
  const byId = new Map(instruments.map(i => [i.id, i]))
  const { lines } = quoteLinesFrom(list.items, list.extras, {
    instruments: r.instrumentIds.map(id => byId.get(id)).filter((i): i is Instrument => !!i).map(i => ({ id: i.id, kind: i.kind, label: instrumentLabel(i) })),
    procedureId: pv?.procedureId ?? -1,
    pointsCount: r.terms.pointsK.length,
    onSite: r.terms.placeOfCalibration === 'on-site',
  })
  for (const old of await Quote.findAll({ where: { requestId: r.id, status: ['draft', 'sent'] }, transaction: t })) {
    await updateAudited(t, user, old, { status: 'superseded' }, { entity: 'Quote', action: 'supersede' })
  }
  const today = await labToday(new Date(), t)
  const { number } = await allocateNumberIn(t, 'quote', today)
  return createAudited(t, user, Quote, {
    number,
    requestId: r.id,
    organizationId: r.organizationId,
    termsVersion: r.termsVersion,
    priceListId: list.id,
    currency: list.currency,
    taxRateBp: list.taxRateBp,
    lines,
    ...assertTotals(lines, list.taxRateBp),
    message: null,
    validUntil: null,
    pdfSha256: null,
    sentAt: null,
    sentBy: null,
    respondedAt: null,
    respondedBy: null,
    purchaseOrder: null,
    declineReason: null,
    createdBy: user.id,
  }, { entity: 'Quote' })
}

/** The laboratory edits a draft: its lines, its message, how long it stands. */
export async function updateQuoteIn(t: Transaction, user: SessionUser, id: number, input: QuoteUpdateInput): Promise<Quote> {
  const q = await findQuote(user, id, t)
  assertVersion(q.version, input.version)
  if (q.status !== 'draft') conflict(`This quote is ${q.status}: only a draft can change (make a new quote instead)`)
  const r = await CalibrationRequest.findByPk(q.requestId, { attributes: ['instrumentIds'], transaction: t })
  const ids = new Set(r?.instrumentIds ?? [])
  input.lines.forEach((l, i) => {
    if (l.instrumentId !== null && !ids.has(l.instrumentId)) invalidInput({ [`lines[${i}].instrumentId`]: 'Not an instrument of this request' })
  })
  const today = await labToday(new Date(), t)
  if (input.validUntil && input.validUntil < today) invalidInput({ validUntil: 'The quote must stand until today or later' })
  await updateAudited(t, user, q, {
    lines: input.lines,
    ...assertTotals(input.lines, q.taxRateBp),
    ...(input.message !== undefined ? { message: input.message } : {}),
    ...(input.validUntil !== undefined ? { validUntil: input.validUntil } : {}),
  }, { entity: 'Quote', action: 'edit' })
  return q
}

/** Send a draft: it stands until `validUntil` (default: the price list's days from today), its PDF is kept, the customer told. */
export async function sendQuoteIn(t: Transaction, user: SessionUser, id: number, input: { version: number }): Promise<Quote> {
  const q = await findQuote(user, id, t)
  assertVersion(q.version, input.version)
  if (q.status !== 'draft') conflict(`This quote is already ${q.status}`)
  const r = await CalibrationRequest.findByPk(q.requestId, { transaction: t })
  if (!r || r.status === 'declined') conflict('The request was declined', 'requestId')
  if (r.termsVersion !== q.termsVersion) conflict('The request’s terms changed after this quote was made: make a new quote for the current terms', 'termsVersion')
  const today = await labToday(new Date(), t)
  const list = q.priceListId ? await PriceList.findByPk(q.priceListId, { transaction: t }) : null
  const validUntil = q.validUntil ?? addDays(today, list?.quoteValidDays ?? 30)
  const sentAt = new Date()
  const pdf = await storePdf(t, await quotePdf(t, { ...q.get({ plain: true }), validUntil, sentAt }, r.id))
  await updateAudited(t, user, q, { status: 'sent', validUntil, sentAt, sentBy: user.id, pdfSha256: pdf.sha256 }, { entity: 'Quote', action: 'send' })
  await notifyQuoteSent(t, q, r.id)
  return q
}

/**
 * The customer accepts a sent quote with its purchase-order number: the request's terms the quote
 * prices are agreed (if not already) and the order is made. 409 when the quote expired or its terms
 * are no longer the request's.
 */
export async function acceptQuoteIn(t: Transaction, user: SessionUser, id: number, input: QuoteAcceptInput): Promise<Order> {
  const q = await findQuote(user, id, t)
  assertVersion(q.version, input.version)
  if (q.status !== 'sent') conflict(q.status === 'accepted' ? 'This quote is already accepted' : `This quote is ${q.status}: it cannot be accepted`)
  const today = await labToday(new Date(), t)
  if (q.validUntil && q.validUntil < today) conflict(`This quote stood until ${q.validUntil}: ask the laboratory for a new one`, 'validUntil')
  const r = await CalibrationRequest.findByPk(q.requestId, { transaction: t, lock: t.LOCK.UPDATE })
  if (!r || r.status === 'declined') conflict('The request was declined', 'requestId')
  if (r.termsVersion !== q.termsVersion) conflict('The laboratory offered new terms after this quote: wait for the new quote', 'termsVersion')
  const now = new Date()
  if (r.agreedTermsVersion !== r.termsVersion) {
    await updateAudited(t, user, r, {
      agreedTermsVersion: r.termsVersion, agreedAt: now, agreedBy: user.id, agreementMethod: 'portal',
      agreementNote: `Agreed by accepting quote ${q.number} with purchase order ${input.purchaseOrder}`,
      status: r.status === 'accepted' ? 'accepted' : 'agreed',
    }, { entity: 'CalibrationRequest', action: 'agree-with-quote' })
  }
  await updateAudited(t, user, q, { status: 'accepted', respondedAt: now, respondedBy: user.id, purchaseOrder: input.purchaseOrder }, { entity: 'Quote', action: 'accept' })
  const { number } = await allocateNumberIn(t, 'order', today)
  return createAudited(t, user, Order, {
    number, quoteId: q.id, requestId: r.id, organizationId: q.organizationId, purchaseOrder: input.purchaseOrder,
    placedAt: now, placedBy: user.id, returnedOn: null, carrier: null, trackingReference: null, returnedBy: null,
  }, { entity: 'Order', action: 'place' })
}

export async function declineQuoteIn(t: Transaction, user: SessionUser, id: number, input: QuoteDeclineInput): Promise<Quote> {
  const q = await findQuote(user, id, t)
  assertVersion(q.version, input.version)
  if (q.status !== 'sent') conflict(`This quote is ${q.status}: it cannot be declined`)
  await updateAudited(t, user, q, { status: 'declined', respondedAt: new Date(), respondedBy: user.id, declineReason: input.reason }, { entity: 'Quote', action: 'decline' })
  return q
}

/** The quote's PDF as sent (404 for a draft, which has none yet). */
export async function quotePdfFile(user: SessionUser, id: number): Promise<StoredFile> {
  const q = await findQuote(user, id)
  if (!q.pdfSha256) notFound('quote PDF: the quote is not sent yet')
  return { sha256: q.pdfSha256, type: 'application/pdf', size: 0, name: `${q.number}.pdf` }
}

// ---------------------------------------------------------------- the routes' operations (one transaction each)

export async function createQuote(user: SessionUser, input: QuoteCreateInput): Promise<QuoteDTO> {
  const q = await inTransaction(t => createQuoteIn(t, user, input))
  return quoteDetail(user, q.id)
}

export async function updateQuote(user: SessionUser, id: number, input: QuoteUpdateInput): Promise<QuoteDTO> {
  await inTransaction(t => updateQuoteIn(t, user, id, input))
  return quoteDetail(user, id)
}

export async function sendQuote(user: SessionUser, id: number, input: { version: number }): Promise<QuoteDTO> {
  await inTransaction(t => sendQuoteIn(t, user, id, input))
  return quoteDetail(user, id)
}

export async function acceptQuote(user: SessionUser, id: number, input: QuoteAcceptInput): Promise<QuoteDTO> {
  await inTransaction(t => acceptQuoteIn(t, user, id, input))
  return quoteDetail(user, id)
}

export async function declineQuote(user: SessionUser, id: number, input: QuoteDeclineInput): Promise<QuoteDTO> {
  await inTransaction(t => declineQuoteIn(t, user, id, input))
  return quoteDetail(user, id)
}
