/**
 * The invented demo laboratory's settings (Harrowfield Radiometric Calibration Laboratory, an
 * invented address and accreditation) and certificates for the two approved demo runs, signed by
 * the demo quality manager: KF-IR-013's issued, then reopened (a 50 °C reading was transcribed
 * wrongly), corrected by the technician, approved and amended; BF-IR-002's issued and then withdrawn. Idempotent: the settings row is created once; a run that already has a certificate is
 * left alone.
 */
import type { Transaction } from 'sequelize'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { Certificate } from '#server/models/Certificate'
import { Instrument } from '#server/models/Instrument'
import { LabSettings } from '#server/models/LabSettings'
import { User } from '#server/models/User'
import { recordAudit, snapshot } from '#server/utils/audit'
import { issueCertificateIn, reopenCertificateIn, withdrawCertificateIn } from '#server/services/certificates/issue'
import { approveRunIn, submitRunIn, updatePointIn } from '#server/services/runs/runs'
import { RunPoint } from '#server/models/RunPoint'

export const DEMO_LAB = {
  name: 'Harrowfield Radiometric Calibration Laboratory',
  addressLines: 'Unit 4, Tenterbrook Science Park\nMill Lane',
  city: 'Harrowfield',
  postcode: 'HF3 7QD',
  country: 'United Kingdom',
  email: 'certificates@harrowfield-radiometric.example',
  phone: '+44 1632 960 733',
  accreditationBody: 'Northmere Accreditation Board (invented)',
  accreditationNumber: 'NAB-CL-0917',
  numberPrefix: 'BL',
  numberIncludesYear: true,
  numberDigits: 5,
  signatoryFunctions: ['Quality manager', 'Deputy quality manager', 'Technical manager'],
  traceabilityStatement: 'The measurements are traceable to the International System of Units (SI) through the International Temperature Scale of 1990, by way of the laboratory’s reference standards listed below, each calibrated by an accredited laboratory or a national metrology institute.',
  decisionRuleStatement: 'The statement of conformity applies only to the points measured.',
  itemsStatement: 'The results relate only to the items calibrated.',
  reproductionStatement: 'This certificate shall not be reproduced except in full without the written approval of the laboratory.',
}

export async function seedCertificates(t: Transaction): Promise<number> {
  let created = 0
  if (!(await LabSettings.count({ transaction: t }))) {
    const row = await LabSettings.create({ ...DEMO_LAB }, { transaction: t })
    await recordAudit(t, { userId: null, action: 'seed', entity: 'LabSettings', entityId: row.id, after: snapshot(row) })
    created++
  }
  const quality = await User.findOne({ where: { email: 'quality@bandlight.test' }, transaction: t })
  const technician = await User.findOne({ where: { email: 'technician@bandlight.test' }, transaction: t })
  if (!quality || !technician) return created
  const signer = { user: quality, signatoryFunction: 'Quality manager' }
  // KF-IR-013: issued, then amended (a reading corrected); BF-IR-002: issued, then withdrawn.
  const demo = [
    { assetTag: 'KF-IR-013', then: 'amend' as const, reason: 'One 50 °C reading was transcribed from the wrong line of the worksheet.' },
    { assetTag: 'BF-IR-002', then: 'withdraw' as const, reason: 'Issued against the wrong purchase order; the customer asked for it to be withdrawn.' },
  ]
  for (const d of demo) {
    const instrument = await Instrument.findOne({ where: { assetTag: d.assetTag }, transaction: t })
    if (!instrument) continue
    const run = await CalibrationRun.findOne({ where: { instrumentId: instrument.id, status: 'approved' }, order: [['calibrationDate', 'ASC']], transaction: t })
    if (!run || await Certificate.count({ where: { runId: run.id }, transaction: t })) continue
    const cert = await issueCertificateIn(t, signer, run.id, 'seed')
    created++
    if (d.then === 'amend') {
      const lab = { id: quality.id, name: quality.name, email: quality.email, role: quality.role, organizationId: null }
      const revision = await reopenCertificateIn(t, lab, cert.id, { reason: d.reason })
      const points = await RunPoint.findAll({ where: { runId: revision.id }, order: [['seq', 'ASC']], transaction: t })
      const p = points[1]!
      const readingsK = [...p.readingsK]
      readingsK[2] = Math.round((readingsK[2]! - 0.4) * 1000) / 1000
      await updatePointIn(t, { id: technician.id }, revision.id, p.id, { readingsK, version: p.version, reason: d.reason })
      let run = (await CalibrationRun.findByPk(revision.id, { transaction: t }))!
      run = await submitRunIn(t, { id: technician.id }, run.id, { version: run.version }, 'seed')
      await approveRunIn(t, { id: quality.id }, run.id, { version: run.version }, 'seed')
      await issueCertificateIn(t, signer, run.id, 'seed')
    }
    else {
      await withdrawCertificateIn(t, quality, cert.id, d.reason)
    }
    created++
  }
  return created
}
