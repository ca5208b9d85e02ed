// Proficiency tests and interlaboratory comparisons (ISO/IEC 17025:2017 7.7.2): E_n and z verdicts at
// and around their limits, through the API. Criteria of ISO 13528:2015 (9.4 and 9.7, clause numbers
// from memory): E_n = (x − X)/√(U_lab² + U_ref²), |E_n| ≤ 1 satisfactory; z = (x − X)/σ_pt, |z| ≤ 2
// satisfactory, 2 < |z| < 3 questionable, |z| ≥ 3 unsatisfactory. Inputs are decimal numbers whose
// scores land exactly on a limit in decimal arithmetic (computed by hand below); in binary they come
// out a few ulps off it (e.g. (273.25 − 273.15)/0.05 = 2.0000000000004547), and the verdict must
// still be the one for the limit itself.
import { beforeAll, describe, expect, it } from 'vitest'
import { signedIn, unique, type Client } from '../support/http'

let quality: Client
let tech: Client

beforeAll(async () => {
  ;[quality, tech] = await Promise.all([signedIn('quality'), signedIn('technician')])
})

const ilc = (labValueK: number, over: Record<string, unknown> = {}) => ({
  schemeType: 'interlaboratory-comparison', scheme: unique('Bilateral comparison '), round: 'R1', artefact: 'Transfer thermometer TT-1',
  pointK: 373.15, labValueK, labUncertaintyK: 0.4, referenceValueK: 373.15, referenceUncertaintyK: 0.3, reportedOn: '2026-10-01', ...over,
})
// σ_pt = 0.05 K; both uncertainties 1 K, so E_n stays below 0.3 and the z score decides.
const pt = (labValueK: number) => ({
  schemeType: 'proficiency-test', scheme: unique('IR scheme '), round: '2026/3', artefact: 'Handheld thermometer',
  pointK: 273.15, labValueK, labUncertaintyK: 1, referenceValueK: 273.15, referenceUncertaintyK: 1, sigmaPtK: 0.05, reportedOn: '2026-10-02',
})

describe('E_n verdicts (U_lab = 0.4 K, U_ref = 0.3 K: √(0.16 + 0.09) = 0.5 K)', () => {
  for (const [x, en, verdict] of [
    [373.65, 1, 'satisfactory'], // 0.5/0.5 = 1: on the limit
    [372.65, -1, 'satisfactory'], // −0.5/0.5
    [373.66, 1.02, 'unsatisfactory'], // 0.51/0.5
    [372.64, -1.02, 'unsatisfactory'],
    [373.64, 0.98, 'satisfactory'], // 0.49/0.5
  ] as const) {
    it(`x = ${x} K: E_n = ${en}, ${verdict}`, async () => {
      const r = await quality.post('/api/proficiency-results', ilc(x))
      expect(r.status, JSON.stringify(r.body)).toBe(201)
      expect(r.body.result.en).toBeCloseTo(en, 9)
      expect(r.body.result).toMatchObject({ enVerdict: verdict, verdict, z: null, zVerdict: null })
      // an unsatisfactory result raises a nonconformity by itself
      if (verdict === 'unsatisfactory') {
        expect(r.body.nonconformity).toMatchObject({ origin: 'proficiency', originId: r.body.result.id, status: 'open' })
        expect(r.body.result.nonconformityNumber).toBe(r.body.nonconformity.number)
      }
      else {
        expect(r.body.nonconformity).toBeNull()
      }
    })
  }
})

describe('z verdicts (σ_pt = 0.05 K, X = 273.15 K)', () => {
  for (const [x, z, verdict] of [
    [273.25, 2, 'satisfactory'], // 0.10/0.05 = 2: on the limit, satisfactory
    [273.05, -2, 'satisfactory'],
    [273.2501, 2.002, 'questionable'],
    [273.2999, 2.998, 'questionable'],
    [273.3, 3, 'unsatisfactory'], // 0.15/0.05 = 3: on the limit, unsatisfactory ("≥ 3")
    [273.0, -3, 'unsatisfactory'],
  ] as const) {
    it(`x = ${x} K: z = ${z}, ${verdict}`, async () => {
      const r = await quality.post('/api/proficiency-results', pt(x))
      expect(r.status, JSON.stringify(r.body)).toBe(201)
      expect(r.body.result.z).toBeCloseTo(z, 9)
      expect(r.body.result.zVerdict).toBe(verdict)
      expect(r.body.result.enVerdict).toBe('satisfactory') // |E_n| ≤ 0.15/√2 ≈ 0.11
      expect(r.body.result.verdict).toBe(verdict)
      expect(r.body.nonconformity === null).toBe(verdict !== 'unsatisfactory')
    })
  }
})

describe('input', () => {
  it('400 naming the field: a z-score scheme without σ_pt; no uncertainty at all; a negative value. Nothing is recorded', async () => {
    const before = (await quality.get('/api/proficiency-results?pageSize=1')).body.total
    const noSigma = await quality.post('/api/proficiency-results', { ...pt(273.2), sigmaPtK: null })
    expect(noSigma.status).toBe(400)
    expect(noSigma.body.data.fields).toHaveProperty('sigmaPtK')
    const noU = await quality.post('/api/proficiency-results', ilc(373.2, { labUncertaintyK: 0, referenceUncertaintyK: 0 }))
    expect(noU.status).toBe(400)
    expect(noU.body.data.fields).toHaveProperty('labUncertaintyK')
    const neg = await quality.post('/api/proficiency-results', ilc(-1))
    expect(neg.status).toBe(400)
    expect(neg.body.data.fields).toHaveProperty('labValueK')
    expect((await quality.get('/api/proficiency-results?pageSize=1')).body.total).toBe(before)
  })

  it('technicians read results but do not record them', async () => {
    expect((await tech.get('/api/proficiency-results')).status).toBe(200)
    expect((await tech.post('/api/proficiency-results', ilc(373.2))).status).toBe(403)
  })
})
