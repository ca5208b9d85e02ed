/**
 * The receipt of the item of a run (ISO/IEC 17025 7.4): recorded once, corrected with its version
 * (and a reason after the run was first submitted). Its date is the run's date of receipt; its
 * words are the certificate's "condition on receipt", so no certificate is issued without it.
 * Frozen with the run under review. The receipt is a record of the item, not of the measurement:
 * goods-in may record it after the run was approved, until the certificate is issued — the
 * signatory sees it in the draft certificate before signing.
 */
import type { Transaction } from 'sequelize'
import type { ReceiptInput } from '#shared/schemas/run'
import type { ItemReceiptDTO } from '#shared/types'
import { ItemReceipt } from '#server/models/ItemReceipt'
import { RunRevision } from '#server/models/RunRevision'
import { User } from '#server/models/User'
import { createAudited, snapshot, updateAudited } from '#server/utils/audit'
import { assertVersion, invalidInput, conflict } from '#server/utils/errors'
import { Certificate } from '#server/models/Certificate'
import { onItemReceivedIn } from '#server/services/billing/orders'
import { FROZEN_MESSAGE, findRun, markChanged, requireReason, type Actor } from './workflow'

export function receiptDTO(r: ItemReceipt, receivedByName: string | null): ItemReceiptDTO {
  return {
    id: r.id,
    runId: r.runId,
    receivedOn: r.receivedOn,
    receivedBy: r.receivedBy,
    receivedByName,
    packaging: r.packaging,
    condition: r.condition,
    accessories: r.accessories ?? null,
    deviations: r.deviations ?? null,
    customerConsulted: !!r.customerConsulted,
    customerDecision: r.customerDecision ?? null,
    version: r.version,
    updatedAt: r.updatedAt.toISOString(),
  }
}

export async function receiptOf(runId: number, transaction?: Transaction): Promise<ItemReceiptDTO | null> {
  const r = await ItemReceipt.findOne({ where: { runId }, transaction })
  if (!r) return null
  const by = await User.findByPk(r.receivedBy, { attributes: ['name'], transaction })
  return receiptDTO(r, by?.name ?? null)
}

/** Record (or correct, with its version) the receipt of the run's item; the run's date of receipt follows it. */
export async function recordReceiptIn(t: Transaction, actor: Actor, runId: number, input: ReceiptInput): Promise<ItemReceipt> {
  const run = await findRun(t, runId)
  if (run.status === 'void') conflict('the run is void')
  if (run.status === 'submitted') conflict(FROZEN_MESSAGE)
  if (run.status === 'approved' && await Certificate.count({ where: { runId }, transaction: t })) conflict('The run is certified: its receipt record is part of the issued certificate and cannot change')
  if (input.receivedOn > run.calibrationDate) invalidInput({ receivedOn: `The item cannot be received after its calibration date (${run.calibrationDate}); change the calibration date first` })
  const reason = requireReason(run, input.reason)
  const values = {
    receivedOn: input.receivedOn,
    packaging: input.packaging,
    condition: input.condition,
    accessories: input.accessories ?? null,
    deviations: input.deviations ?? null,
    customerConsulted: input.customerConsulted,
    customerDecision: input.customerDecision ?? null,
  }
  const existing = await ItemReceipt.findOne({ where: { runId }, transaction: t })
  let receipt: ItemReceipt
  if (existing) {
    if (input.version === undefined) invalidInput({ version: 'The receipt is already recorded: send its version to correct it' })
    assertVersion(existing.version, input.version)
    const before = snapshot(existing)
    await updateAudited(t, actor, existing, values, { entity: 'ItemReceipt', extra: reason ? { reason } : undefined })
    if (reason) await RunRevision.create({ runId, pointId: null, userId: actor.id, at: new Date(), reason, before: { receipt: before }, after: { receipt: snapshot(existing) } }, { transaction: t })
    receipt = existing
  }
  else {
    receipt = await createAudited(t, actor, ItemReceipt, { runId, receivedBy: actor.id, ...values }, { entity: 'ItemReceipt', action: 'receive' })
    // An order's customer hears that the instrument arrived.
    await onItemReceivedIn(t, run, receipt)
  }
  run.receivedDate = receipt.receivedOn
  await markChanged(t, run, actor)
  return receipt
}
