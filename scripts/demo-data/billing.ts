/**
 * The demo laboratory's price list (invented prices, GBP, 20 % tax, 30 days to pay) and one piece of
 * billing history: Pellucid Float Glass asked by telephone in October 2026 for two 8–14 µm handhelds,
 * accepted quote Q-2026-… with purchase order PFG-4471, and was invoiced in advance on 2026-10-20 —
 * due 2026-11-19 and still unpaid, so it shows as overdue and the weekly reminder picks it up.
 * Idempotent: the price list is saved once; the order is looked up by its purchase order.
 */
import type { Transaction } from 'sequelize'
import { totalsOf } from '#shared/billing/money'
import type { RequestTerms } from '#shared/types/requests'
import { CalibrationRequest } from '#server/models/CalibrationRequest'
import { Instrument } from '#server/models/Instrument'
import { Order } from '#server/models/Order'
import { Organization } from '#server/models/Organization'
import { PriceList } from '#server/models/PriceList'
import { Procedure } from '#server/models/Procedure'
import { ProcedureVersion } from '#server/models/ProcedureVersion'
import { Quote } from '#server/models/Quote'
import { User } from '#server/models/User'
import { recordAudit, snapshot } from '#server/utils/audit'
import { allocateNumberIn } from '#server/services/billing/counters'
import { quotePdf, storePdf } from '#server/services/billing/documents'
import { issueInvoiceIn } from '#server/services/billing/invoices'
import { savePriceListIn } from '#server/services/billing/prices'
import { quoteLinesFrom } from '#shared/billing/lines'

const PLATE = 'Wideband 8–14 µm thermometers on the flat plate'
const CAVITY = 'Short-wave thermometers on cavity sources'
const PO = 'PFG-4471'

export async function seedBilling(t: Transaction): Promise<number> {
  let created = 0
  const admin = await User.findOne({ where: { email: 'admin@bandlight.test' }, transaction: t })
  if (!admin) return 0
  const procs = new Map((await Procedure.findAll({ where: { name: [PLATE, CAVITY] }, transaction: t })).map(p => [p.name, p]))
  if (!(await PriceList.count({ transaction: t }))) {
    await savePriceListIn(t, admin, {
      currency: 'GBP',
      taxRatePercent: 20,
      paymentTermsDays: 30,
      quoteValidDays: 30,
      bankDetails: 'Harrowfield Mutual Bank (invented), sort code 00-00-00, account 00000000, IBAN GB00 HMUT 0000 0000 0000 00',
      note: 'Prices for the demo (invented).',
      items: [
        ...(procs.get(PLATE) ? [{ label: 'Wideband 8–14 µm on the flat plate', procedureId: procs.get(PLATE)!.id, instrumentKind: null, priceMinor: 18000, includedPoints: 3, extraPointMinor: 2500 }] : []),
        ...(procs.get(CAVITY) ? [{ label: 'Short-wave on cavity sources', procedureId: procs.get(CAVITY)!.id, instrumentKind: null, priceMinor: 26000, includedPoints: 3, extraPointMinor: 4000 }] : []),
        { label: 'Thermal imager', procedureId: null, instrumentKind: 'thermal-imager' as const, priceMinor: 42000, includedPoints: 5, extraPointMinor: 4500 },
        { label: 'Other radiation thermometers', procedureId: null, instrumentKind: null, priceMinor: 24000, includedPoints: 3, extraPointMinor: 3500 },
      ],
      extras: { expressMinor: 9000, onSiteMinor: 35000, adjustmentMinor: 6000 },
    })
    created++
  }

  if (await Order.findOne({ where: { purchaseOrder: PO }, transaction: t })) return created
  const org = await Organization.findOne({ where: { name: 'Pellucid Float Glass' }, transaction: t })
  const plate = procs.get(PLATE)
  const pv = plate?.currentVersionId ? await ProcedureVersion.findByPk(plate.currentVersionId, { transaction: t }) : null
  const list = await PriceList.findOne({ order: [['versionNumber', 'DESC']], transaction: t })
  if (!org || !pv || !list) return created
  const instruments = await Instrument.findAll({ where: { organizationId: org.id, kind: 'spot-infrared', bandLambda1Um: 8, bandLambda2Um: 14, archived: false }, order: [['id', 'ASC']], limit: 2, transaction: t })
  if (!instruments.length) return created
  const pointsK = [273.15, 323.15, 373.15, 423.15]
  const terms: RequestTerms = {
    procedureVersionId: pv.id, pointsK, distanceMm: 300, emissivitySetting: 0.95, specification: null, decisionRule: 'simple-acceptance', guardBandFactor: null,
    placeOfCalibration: 'laboratory', siteAddress: null, message: null, procedureName: pv.name, procedureVersionNumber: pv.versionNumber, capability: [],
  }
  const at = (d: string) => new Date(`${d}T10:00:00Z`)
  const request = await CalibrationRequest.create({
    organizationId: org.id, requestedBy: admin.id, instrumentIds: instruments.map(i => i.id), preferredDate: '2026-12-14', requirements: 'At 0, 50, 100 and 150 °C',
    specification: null, notes: 'Requested by telephone by Maren Oosterveld; entered by the laboratory.', terms, termsVersion: 1, reviewedBy: admin.id, reviewedAt: at('2026-10-12'),
    agreedTermsVersion: 1, agreedAt: at('2026-10-14'), agreedBy: admin.id, agreementMethod: 'recorded', agreementNote: `Agreed with purchase order ${PO}`,
    status: 'agreed', handledBy: null, handledAt: null, response: null,
  }, { transaction: t })
  await recordAudit(t, { userId: null, action: 'seed', entity: 'CalibrationRequest', entityId: request.id, after: snapshot(request) })
  const { lines } = quoteLinesFrom(list.items, list.extras, { instruments: instruments.map(i => ({ id: i.id, kind: i.kind, label: `${i.maker} ${i.model}, serial ${i.serial}` })), procedureId: pv.procedureId, pointsCount: pointsK.length, onSite: false })
  const { number } = await allocateNumberIn(t, 'quote', '2026-10-12')
  const values = {
    number, requestId: request.id, organizationId: org.id, termsVersion: 1, priceListId: list.id, currency: list.currency, taxRateBp: list.taxRateBp, lines, ...totalsOf(lines, list.taxRateBp),
    message: 'Advance invoice on acceptance, as agreed for this order.', validUntil: '2026-11-11', sentAt: at('2026-10-12'), sentBy: admin.id,
    respondedAt: at('2026-10-14'), respondedBy: admin.id, purchaseOrder: PO, declineReason: null, createdBy: admin.id, createdAt: at('2026-10-12'),
  }
  const pdf = await storePdf(t, await quotePdf(t, values, request.id))
  const quote = await Quote.create({ ...values, status: 'accepted', pdfSha256: pdf.sha256 }, { transaction: t })
  await recordAudit(t, { userId: null, action: 'seed', entity: 'Quote', entityId: quote.id, after: snapshot(quote) })
  const orderNumber = await allocateNumberIn(t, 'order', '2026-10-14')
  const order = await Order.create({ number: orderNumber.number, quoteId: quote.id, requestId: request.id, organizationId: org.id, purchaseOrder: PO, placedAt: at('2026-10-14'), placedBy: admin.id, returnedOn: null, carrier: null, trackingReference: null, returnedBy: null }, { transaction: t })
  await recordAudit(t, { userId: null, action: 'seed', entity: 'Order', entityId: order.id, after: snapshot(order) })
  await issueInvoiceIn(t, order, { origin: 'manual', actorId: admin.id, issueDate: '2026-10-20' })
  return created + 4
}
