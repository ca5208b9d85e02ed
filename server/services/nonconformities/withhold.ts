/**
 * The withhold switch of a nonconformity (ISO/IEC 17025:2017 7.10.1 b): while an open
 * nonconformity withholds, no certificate is issued from a run that used its item on a date in its
 * affected period (409 naming the nonconformity). The revision run opened by the nonconformity's
 * own "amend" decision is exempt: it is how the affected certificate gets corrected.
 * Kept apart from ./nonconformities.ts, which builds on certificate issuing, so issuing can ask
 * this without a cycle.
 */
import type { Transaction } from 'sequelize'
import type { CalibrationRun } from '#server/models/CalibrationRun'
import { Nonconformity } from '#server/models/Nonconformity'
import { NonconformityDecision } from '#server/models/NonconformityDecision'
import { RunPoint } from '#server/models/RunPoint'
import { conflict } from '#server/utils/errors'
import { findEquipment } from '#server/services/quality/records'

/** The open, withholding nonconformity that blocks issuing from this run (with the item's tag), or null. */
export async function withholdingNonconformity(t: Transaction | undefined, run: CalibrationRun): Promise<{ nc: Nonconformity, tag: string } | null> {
  const open = await Nonconformity.findAll({ where: { status: 'open', withhold: true }, order: [['id', 'ASC']], transaction: t })
  for (const nc of open) {
    if (!nc.equipmentType || !nc.equipmentId || !nc.affectedFrom || !nc.affectedTo) continue
    if (run.calibrationDate < nc.affectedFrom || run.calibrationDate > nc.affectedTo) continue
    const column = nc.equipmentType === 'source' ? 'sourceId' : 'referenceInstrumentId'
    const uses = await RunPoint.count({ where: { runId: run.id, [column]: nc.equipmentId, voidedAt: null }, transaction: t })
    if (!uses) continue
    const exempt = await NonconformityDecision.count({ where: { nonconformityId: nc.id, revisionRunId: run.id }, transaction: t })
    if (exempt) continue
    const item = await findEquipment(nc.equipmentType, nc.equipmentId, t)
    return { nc, tag: item?.assetTag ?? `${nc.equipmentType} ${nc.equipmentId}` }
  }
  return null
}

/** 409 naming the nonconformity when issuing from this run is withheld. */
export async function assertNotWithheld(t: Transaction | undefined, run: CalibrationRun): Promise<void> {
  const hit = await withholdingNonconformity(t, run)
  if (hit) {
    conflict(`Issuing is withheld by nonconformity ${hit.nc.number} (${hit.nc.title}): run ${run.id} used ${hit.tag} on ${run.calibrationDate}, inside its affected period ${hit.nc.affectedFrom} to ${hit.nc.affectedTo}. The quality manager decides on the affected work and switches the withhold off first.`, 'runId')
  }
}
