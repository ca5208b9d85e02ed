// What a certificate states for each kind of instrument (server/services/certificates/pdf.ts and the DCC
// writer server/services/dcc/build.ts), from plain data without a server: a ratio pyrometer's bands, ratio
// setting and source emissivity in each band; a thermal imager's settings, centre error with U, uniformity,
// ROI positions and NETD ("common practice"); a calibration equation's table marked as interpolated.
// The PDF's text is read back with pdftotext and the DCC validated against PTB's schema with xmllint
// (each skipped, and reported so, where the tool is missing). The numbers are invented.
import { describe, expect, it } from 'vitest'
import { buildDcc } from '../../../server/services/dcc/build'
import { certificatePdf, type CertificateData } from '../../../server/services/certificates/pdf'
import { sampleCertificateData } from '../../../server/services/certificates/sample'
import { hasXmllint, validateDcc } from '../../support/dccSchema'
import { hasPdftotext, pdfText } from '../../support/pdf'

function ratioCertificate(): CertificateData {
  const d = sampleCertificateData(3)
  return {
    ...d,
    instrument: { ...d.instrument, kind: 'Ratio pyrometer', band: 'band 1: 0.95–1 µm; band 2: 1–1.05 µm' },
    environment: { ...d.environment, emissivitySetting: null, instrumentK: null },
    ratio: { band1: '0.95–1 µm', band2: '1–1.05 µm', emissivityRatioSetting: 1.02, sources: [{ assetTag: 'BB-CV-09', emissivity1: '0.8825', emissivity2: '0.8775' }] },
  }
}

function imagerCertificate(): CertificateData {
  const d = sampleCertificateData(3)
  return {
    ...d,
    instrument: { ...d.instrument, kind: 'Thermal imager' },
    points: d.points.map((p, i) => ({ ...p, imager: { roiCount: 5, rangeText: ['0.35', '0.42', '0.50'][i]!, sdText: ['0.14', '0.17', '0.20'][i]! } })),
    imager: {
      lens: 'Standard 25 mm lens', fieldOfView: '24° × 18°', rangeSetting: '−20 °C to 150 °C', nonUniformityCorrection: true, centreRoi: 'centre',
      rois: [{ name: 'centre', xPx: 150, yPx: 110, widthPx: 20, heightPx: 20 }, { name: 'top-left', xPx: 40, yPx: 30, widthPx: 20, heightPx: 20 }],
      netd: [{ referenceK: 323.15, netdText: '0.031', roiCount: 5, frameCount: 16 }],
    },
  }
}

function equationCertificate(): CertificateData {
  const d = sampleCertificateData(5)
  return {
    ...d,
    equation: {
      points: 'all', pointCount: 5, pointCorrelation: 0.3,
      parameters: [{ name: 'A', valueText: '0.8765686', uText: '0.017', unit: 'µm' }, { name: 'B', valueText: '30.17355', uText: '9.9', unit: 'µm·K' }, { name: 'C', valueText: '0.9963913', uText: '0.13', unit: '1' }],
      nominalText: 'A₀ = 0.896296 µm, B₀ = 29.6045 µm·K, c₂ = 14387.76877 µm·K',
      chiSquaredText: '0.00606', degreesOfFreedom: 2, rangeK: { min: 263.15, max: 423.15 }, coverageFactor: 2,
      rows: [{ temperatureK: 298.15, readingText: '24.8', correctionText: '0.2', uncertaintyText: '0.6' }, { temperatureK: 373.15, readingText: '99.7', correctionText: '0.3', uncertaintyText: '0.7' }],
    },
  }
}

const dccOf = (content: CertificateData) => buildDcc({
  content,
  certificate: { number: content.number, calibrationDate: content.dates.calibrated, issueDate: content.dates.issued },
  pdf: { bytes: Buffer.from('%PDF-1.7\n%%EOF\n'), fileName: `${content.number}.pdf` },
  previousReport: null,
  engineVersions: ['1.3.0'],
})

describe('a certificate by kind of instrument', () => {
  it.skipIf(!hasPdftotext)('a ratio pyrometer’s states both bands, its ratio setting and the source’s ε in each band, and no emissivity setting', async () => {
    const t = pdfText(await certificatePdf(ratioCertificate()))
    for (const s of ['Band 1 0.95–1 µm', 'Band 2 1–1.05 µm', 'Emissivity-ratio setting 1.020', 'ratio (two-colour) pyrometer', 'BB-CV-09 ε1 = 0.8825 in band 1, ε2 = 0.8775 in band 2']) expect(t, s).toContain(s)
    expect(t).not.toContain('Emissivity setting 0.950')
    expect(t).not.toContain('Instrument temperature')
  })

  it.skipIf(!hasPdftotext)('a thermal imager’s states its settings, the centre error with U and the uniformity per point, the ROIs and the NETD as common practice', async () => {
    const t = pdfText(await certificatePdf(imagerCertificate()))
    for (const s of ['Lens Standard 25 mm lens', 'Field of view 24° × 18°', 'Range setting −20 °C to 150 °C', 'Non-uniformity correction done before measuring',
      'Thermal imager: centre region of interest and uniformity', 'Error at the centre ROI', 'max − min', '0.42', '0.17', 'top-left', '150', 'NETD = 0.031 K',
      'common practice — no standard is named']) expect(t, s).toContain(s)
  })

  it.skipIf(!hasPdftotext)('a calibration equation’s table is marked interpolated and bounded to the calibrated range', async () => {
    const t = pdfText(await certificatePdf(equationCertificate()))
    for (const s of ['Calibration equation (interpolated values)', '25.0 (interpolated)', 'they were not measured', 'must not be extrapolated', 'r = 0.30', 'A₀ = 0.896296 µm', 'A = 0.8765686 µm (u = 0.017 µm)', '−10.0 °C to 150.0 °C']) expect(t, s).toContain(s)
  })

  it.skipIf(!hasXmllint)('the DCCs of each kind validate against PTB’s schema; the imager’s carries the uniformity per point', () => {
    for (const d of [ratioCertificate(), imagerCertificate(), equationCertificate()]) {
      const xml = dccOf(d)
      const v = validateDcc(xml)
      expect(v.valid, v.output).toBe(true)
    }
    const imager = dccOf(imagerCertificate()).toString('utf8')
    expect(imager).toContain('Non-uniformity over the regions of interest (max − min of the ROI means)')
    expect(imager).toMatch(/<si:value>0\.42<\/si:value>/)
    const ratio = dccOf(ratioCertificate()).toString('utf8')
    expect(ratio).toContain('Emissivity-ratio setting')
    expect(ratio).not.toContain('<dcc:content lang="en">Emissivity setting</dcc:content>')
  })
})
