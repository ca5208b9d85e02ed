/**
 * The one way a nonconformity comes into being — by hand (./nonconformities.ts) or raised by an
 * event: a failed intermediate check (server/services/checks), an unsatisfactory proficiency result
 * (server/services/proficiency), a reference found out of tolerance at its calibration
 * (server/services/equipment). The affected work as it stands is kept with the record; the item of
 * a failed check goes out of service with the reason, which the run form's setup check states when
 * it refuses the item.
 */
import type { Transaction } from 'sequelize'
import type { NonconformityOrigin, RiskLevel } from '#shared/quality/constants'
import type { EquipmentType } from '#shared/registers/constants'
import { Nonconformity } from '#server/models/Nonconformity'
import { createAudited, updateAudited } from '#server/utils/audit'
import { affectedWork, firstUse, lastGoodEvidence } from '#server/services/impact/impact'
import { findEquipment, nextRecordNumber } from '#server/services/quality/records'
import { labToday } from '#server/services/settings/today'

export interface RaiseSpec {
  origin: NonconformityOrigin
  originId: number | null
  title: string
  description: string
  risk: RiskLevel
  withhold: boolean
  equipment: { type: EquipmentType, id: number } | null
  affectedFrom: string | null
  affectedTo: string | null
  referenceCorrections: [number, number][] | null
  /** Default: today in the laboratory. */
  raisedOn?: string
}

/** Raise a nonconformity in the caller's transaction (audited), keeping the affected work as it stands. */
export async function raiseNonconformityIn(t: Transaction, actor: { id: number } | null, spec: RaiseSpec): Promise<Nonconformity> {
  const raisedOn = spec.raisedOn ?? await labToday(new Date(), t)
  const number = await nextRecordNumber(t, Nonconformity, 'NC', raisedOn)
  const e = spec.equipment
  const snapshot = e && spec.affectedFrom && spec.affectedTo
    ? await affectedWork(e.type, e.id, spec.affectedFrom, spec.affectedTo, spec.referenceCorrections, t)
    : null
  return createAudited(t, actor, Nonconformity, {
    number,
    raisedOn,
    raisedBy: actor?.id ?? null,
    origin: spec.origin,
    originId: spec.originId,
    title: spec.title,
    description: spec.description,
    risk: spec.risk,
    withhold: spec.withhold,
    equipmentType: e?.type ?? null,
    equipmentId: e?.id ?? null,
    affectedFrom: e ? spec.affectedFrom : null,
    affectedTo: e ? spec.affectedTo : null,
    referenceCorrections: e ? spec.referenceCorrections : null,
    affectedWork: snapshot,
    resumedAt: null,
    resumedBy: null,
    resumeNote: null,
    closedAt: null,
    closedBy: null,
    closeNote: null,
  }, { entity: 'Nonconformity', action: spec.origin === 'manual' ? 'create' : `raise-on-${spec.origin}`, omit: ['affectedWork'] })
}

/**
 * The period of work affected by a fault found on `foundOn`: from the last good evidence (its
 * latest passing check or calibration before that date; else its first use) to `foundOn`, both
 * included.
 */
export async function affectedPeriod(type: EquipmentType, id: number, foundOn: string, t: Transaction): Promise<{ from: string, to: string }> {
  const good = await lastGoodEvidence(type, id, foundOn, t)
  const first = good ? null : await firstUse(type, id, t)
  const from = good ?? (first && first < foundOn ? first : foundOn)
  return { from, to: foundOn }
}

/** Take an item out of service with the reason (stated by the run form's refusal), audited. */
export async function takeOutOfServiceIn(t: Transaction, actor: { id: number } | null, type: EquipmentType, id: number, reason: string): Promise<void> {
  const item = await findEquipment(type, id, t)
  if (!item) return
  await updateAudited(t, actor, item, { status: 'out-of-service', statusReason: reason } as never, { entity: type === 'source' ? 'BlackbodySource' : 'ReferenceInstrument', action: 'out-of-service' })
}
