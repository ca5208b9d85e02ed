/**
 * An invented certificate's data, for the PDF unit tests and the benchmark: a handheld 8–14 µm
 * thermometer of an invented customer, calibrated on an invented laboratory's flat plate, with
 * `points` points spread from −10 °C to 150 °C (the last third as left after an adjustment when
 * `adjusted`). Nothing here reads a database.
 */
import type { CertificateData, CertificatePoint } from './pdf'

export function sampleCertificateData(points = 12, opts: { adjusted?: boolean, revision?: number, agreed?: boolean, draft?: boolean } = {}): CertificateData {
  const adjusted = opts.adjusted ?? false
  const revision = opts.revision ?? 0
  const list: CertificatePoint[] = []
  const found = adjusted ? Math.ceil(points / 2) : points
  for (let i = 0; i < points; i++) {
    const stage = i < found ? 'as-found' : 'as-left'
    const j = stage === 'as-found' ? i : i - found
    const n = stage === 'as-found' ? found : points - found
    const refC = n === 1 ? 50 : -10 + (160 * j) / (n - 1)
    const referenceK = Math.round((refC + 273.15) * 100) / 100
    const errorK = stage === 'as-found' ? (adjusted ? -1.1 - 0.004 * refC : 0.15 + 0.006 * refC - 0.0001 * refC * refC) : 0.05 - 0.001 * refC
    const uncertaintyK = refC < 50 ? 0.6 : 0.8
    const toleranceK = Math.max(1, (refC + 273.15 - 273.15) * 0.01)
    const expectedK = referenceK - 0.35 + 0.002 * refC
    const verdict = Math.abs(errorK) + uncertaintyK <= toleranceK ? 'pass' : Math.abs(errorK) <= toleranceK ? 'conditional-pass' : Math.abs(errorK) - uncertaintyK <= toleranceK ? 'conditional-fail' : 'fail'
    list.push({
      stage, referenceK, expectedK, meanK: expectedK + errorK, errorK, uncertaintyK, coverageFactor: 2,
      errorText: errorK.toFixed(1), uncertaintyText: uncertaintyK.toFixed(1), n: 5, toleranceK, acceptanceLimitK: toleranceK, verdict,
    })
  }
  const number = revision ? `BL-2026-00042-R${revision}` : 'BL-2026-00042'
  return {
    number,
    revision,
    amends: revision ? { number: revision > 1 ? `BL-2026-00042-R${revision - 1}` : 'BL-2026-00042', issueDate: '2026-11-12', reason: 'A reading at 50 °C was transcribed wrongly', changes: ['Point 4, reading 2: 50.4 °C → 50.2 °C', 'Point 4, error: +0.3 °C → +0.2 °C'] } : null,
    ...(opts.draft ? { draft: true } : {}),
    lab: {
      name: 'Harrowfield Radiometric Calibration Laboratory',
      addressLines: ['Unit 4, Tenterbrook Science Park', 'Mill Lane', 'Harrowfield HF3 7QD', 'United Kingdom'],
      email: 'certificates@harrowfield-radiometric.example',
      phone: '+44 1632 960 733',
      accreditationBody: 'National Accreditation Service (invented)',
      accreditationNumber: 'CL-0917',
    },
    customer: { name: 'Kestrelmoor Foundry Ltd', addressLines: ['Furnace Row 12', 'Kestrelmoor KM2 4BX', 'United Kingdom'] },
    instrument: {
      maker: 'Orrin Thermal', model: 'HT-814 handheld', serial: 'OT-HT-KF01221', assetTag: 'KF-IR-015', kind: 'Handheld radiation thermometer',
      band: '8–14 µm', rangeText: '−30 °C to 500 °C', resolutionText: '0.1 °C', accuracyText: '±1 % of reading or ±1 °C, whichever is greater',
    },
    receipt: { receivedOn: '2026-11-02', packaging: 'Maker’s carry case, intact', condition: 'Lens scratched near the rim; display and buttons work', accessories: 'Carry case, two AA cells', deviations: 'Lens scratched near the rim', customerConsulted: true, customerDecision: 'Calibrate as received (telephone, 2 November)' },
    place: { kind: 'laboratory', addressLines: ['Unit 4, Tenterbrook Science Park', 'Mill Lane', 'Harrowfield HF3 7QD'] },
    methodDeviations: null,
    referenceBasis: 'The reference temperature is the radiance temperature of the flat plate in 8–14 µm (emissivity setting 1) stated by its calibration certificate, corrected as that certificate states.',
    method: { procedureName: 'Wideband 8–14 µm thermometers on the flat plate', documentReference: 'BL-CP-07 issue 3', versionNumber: 1 },
    dates: { received: '2026-11-02', calibrated: '2026-11-09', issued: '2026-11-12' },
    environment: { ambientK: 296.15, relativeHumidityPct: 42, distanceMm: 300, emissivitySetting: 0.95, reflectedK: 296.15, instrumentK: 296.65, measuredWith: 'REF-AMB-01' },
    adjusted,
    points: list,
    coverageProbability: 0.9545,
    equipment: [
      { role: 'Blackbody source', assetTag: 'BB-FP-01', description: 'Norrvik Instruments FP-150 Plate, serial NV-FP150-0412', certificateNumber: 'HTS-26-0311', provider: 'Heathcote Thermal Standards', calibrationDate: '2026-03-10' },
      { role: 'Ambient sensor', assetTag: 'REF-AMB-01', description: 'Brisk Meteor Devices TA-5 room sensor', certificateNumber: 'HTS-26-0116', provider: 'Heathcote Thermal Standards', calibrationDate: '2026-01-16' },
    ],
    statements: {
      traceability: 'The measurements are traceable to the International System of Units (SI) through the ITS-90 realized by national metrology institutes, by way of the laboratory’s reference standards listed below and their calibrations.',
      decisionRule: 'The statement of conformity applies only to the points measured.',
      items: 'The results relate only to the items calibrated.',
      reproduction: 'This certificate shall not be reproduced except in full without the written approval of the laboratory.',
    },
    agreement: opts.agreed === false ? null : { agreedOn: '2026-10-28', how: 'accepted by the customer in the portal', ruleLabel: 'Simple acceptance', guardBandText: 'w = 0', ruleReference: 'ILAC-G8:09/2019', specificationText: 'the specification agreed, ±1 % of reading or ±1 °C, whichever is greater' },
    remarks: adjusted ? 'Found reading low; the offset was adjusted with the maker’s service software and the instrument measured again.' : null,
    signatory: { name: 'Quinn Halvorsen', function: 'Quality manager', meaning: 'authorized for issue', signedAt: '2026-11-12T10:24:00.000Z' },
    verification: { code: '7K2M9QXP4R', url: `http://localhost:3000/verify?number=${encodeURIComponent(number)}&code=7K2M9QXP4R` },
  }
}
