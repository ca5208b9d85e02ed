/**
 * The invented demo laboratory's settings (Harrowfield Radiometric Calibration Laboratory, an
 * invented address and accreditation) and certificates for the two approved demo runs, signed by
 * the demo quality manager: KF-IR-013's issued and then amended, BF-IR-002's issued and then
 * withdrawn. Idempotent: the settings row is created once; a run that already has a certificate is
 * left alone.
 */
import type { Transaction } from 'sequelize'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { Certificate } from '#server/models/Certificate'
import { Instrument } from '#server/models/Instrument'
import { LabSettings } from '#server/models/LabSettings'
import { User } from '#server/models/User'
import { recordAudit, snapshot } from '#server/utils/audit'
import { amendCertificateIn, issueCertificateIn, withdrawCertificateIn } from '#server/services/certificates/certificates'

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
  decisionRuleStatement: 'The statement of conformity applies to the points measured, against the specification the customer named when ordering the calibration.',
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
  if (!quality) return created
  const signer = { user: quality, signatoryFunction: 'Quality manager' }
  // KF-IR-013: issued, then amended (a corrected customer reference); BF-IR-002: issued, then withdrawn.
  const demo = [
    { assetTag: 'KF-IR-013', then: 'amend' as const, reason: 'Customer asset reference corrected on the customer\'s request; results unchanged.' },
    { assetTag: 'BF-IR-002', then: 'withdraw' as const, reason: 'Issued against the wrong purchase order; the customer asked for it to be withdrawn.' },
  ]
  for (const d of demo) {
    const instrument = await Instrument.findOne({ where: { assetTag: d.assetTag }, transaction: t })
    if (!instrument) continue
    const run = await CalibrationRun.findOne({ where: { instrumentId: instrument.id, status: 'approved' }, order: [['calibrationDate', 'ASC']], transaction: t })
    if (!run || await Certificate.count({ where: { runId: run.id }, transaction: t })) continue
    const cert = await issueCertificateIn(t, signer, run.id, 'seed')
    created++
    if (d.then === 'amend') await amendCertificateIn(t, signer, cert.id, d.reason)
    else await withdrawCertificateIn(t, quality, cert.id, d.reason)
    created++
  }
  return created
}
