/** Demo calibration requests (invented): two open requests from the demo customer in the lab's queue. */
import type { Transaction } from 'sequelize'
import { CalibrationRequest } from '#server/models/CalibrationRequest'
import { Instrument } from '#server/models/Instrument'
import { Organization } from '#server/models/Organization'
import { User } from '#server/models/User'
import { recordAudit, snapshot } from '#server/utils/audit'

const DEMO_REQUESTS = [
  { offset: 0, take: 2, preferredDate: '2027-01-12', notes: 'Both pyrometers come off the ladle line in the first week of January; please confirm a slot.' },
  { offset: 2, take: 1, preferredDate: null, notes: 'Spare unit from the casting bay. It reads high on the cold side, as we see it.' },
] as const

export async function seedRequests(t: Transaction): Promise<number> {
  let created = 0
  const customer = await User.findOne({ where: { email: 'customer@bandlight.test' }, transaction: t })
  const org = customer?.organizationId ? await Organization.findByPk(customer.organizationId, { transaction: t }) : null
  if (!customer || !org) return 0
  for (const spec of DEMO_REQUESTS) {
    if (await CalibrationRequest.findOne({ where: { organizationId: org.id, notes: spec.notes }, transaction: t })) continue
    const requester = customer
    const instruments = await Instrument.findAll({ where: { organizationId: org.id, archived: false, status: 'active' }, order: [['nextDueDate', 'ASC'], ['id', 'ASC']], offset: spec.offset, limit: spec.take, transaction: t })
    if (!instruments.length) continue
    const r = await CalibrationRequest.create({
      organizationId: org.id,
      requestedBy: requester.id,
      instrumentIds: instruments.map(i => i.id),
      preferredDate: spec.preferredDate,
      notes: spec.notes,
      handledBy: null,
      handledAt: null,
      response: null,
    }, { transaction: t })
    await recordAudit(t, { userId: null, action: 'seed', entity: 'CalibrationRequest', entityId: r.id, after: snapshot(r) })
    created++
  }
  return created
}
