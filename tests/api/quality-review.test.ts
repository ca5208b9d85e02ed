// The quality manager's overview and the management-review summary (ISO/IEC 17025:2017 8.9), as JSON
// and as a PDF whose text (read with pdftotext) states the same counts.
//
// June 2026 holds only demo records (scripts/demo-data/quality.ts; the tests here date theirs in 2025,
// October–November 2026 or before 2026): the monthly checks of BB-FP-01 (2026-06-02), BB-CV-02
// (2026-06-05) and BB-CV-03 (2026-06-12), all passed; the interlaboratory comparison RT-ILC-2026 reported
// 2026-06-18 (E_n = 0.32, satisfactory); no nonconformity, complaint, corrective action, run or certificate.
import { beforeAll, describe, expect, it } from 'vitest'
import { BASE_URL, signedIn, type Client } from '../support/http'
import { hasPdftotext, pdfText } from '../support/pdf'

let quality: Client
let admin: Client

async function pdf(c: Client, query: string): Promise<{ status: number, type: string | null, bytes: Buffer }> {
  const res = await fetch(`${BASE_URL}/api/quality/management-review/pdf?${query}`, { headers: { cookie: c.cookieHeader() } })
  return { status: res.status, type: res.headers.get('content-type'), bytes: Buffer.from(await res.arrayBuffer()) }
}

/** The count lines as the PDF prints them (label: key of `counts`). */
const LINES: [string, string][] = [
  ['Intermediate checks performed', 'checksPerformed'], ['Intermediate checks failed', 'checksFailed'],
  ['Proficiency results satisfactory', 'proficiencySatisfactory'], ['Proficiency results questionable', 'proficiencyQuestionable'],
  ['Nonconformities raised', 'nonconformitiesRaised'], ['Complaints received', 'complaintsReceived'],
  ['Corrective actions opened', 'correctiveActionsOpened'], ['Calibration runs', 'runs'], ['Certificates issued', 'certificatesIssued'],
]

beforeAll(async () => {
  ;[quality, admin] = await Promise.all([signedIn('quality'), signedIn('admin')])
})

describe('the quality overview', () => {
  it('lists the demo’s open nonconformity, the corrective action awaiting its check, the open complaint and both comparison results, each with its page', async () => {
    const o = (await quality.get('/api/quality/overview')).body
    for (const key of ['openNonconformities', 'checksDue', 'checksOverdue', 'failedChecks', 'openComplaints', 'overdueActions', 'actionsAwaitingEffectiveness', 'proficiencyResults']) {
      expect(Array.isArray(o[key]), key).toBe(true)
    }
    const nc = o.openNonconformities.find((n: { title: string }) => n.title === 'BB-CV-02 failed its intermediate check on 2026-11-30')
    expect(nc).toMatchObject({ origin: 'check', withhold: true, equipmentTag: 'BB-CV-02', link: `/quality/nonconformities/${nc.id}` })
    expect(o.openComplaints.some((c: { subject: string, status: string }) => c.subject === 'The 50 °C result looks wrong' && c.status === 'outcome-proposed')).toBe(true)
    const demoPt = o.proficiencyResults.filter((r: { scheme: string }) => /RT-ILC-2026|IR-PT/.test(r.scheme))
    expect(demoPt.map((r: { schemeType: string, verdict: string }) => [r.schemeType, r.verdict]).sort()).toEqual([['interlaboratory-comparison', 'satisfactory'], ['proficiency-test', 'questionable']])
    expect((await (await signedIn('technician')).get('/api/quality/overview')).status).toBe(403)
  })

  it('the demo check plans: about ten checks per source, one failed (BB-CV-02 on 2026-11-30), its source out of service', async () => {
    const plans = (await quality.get('/api/check-plans?equipmentType=source')).body as { id: number, equipmentTag: string, lastCheckedOn: string, lastVerdict: string }[]
    const demo = plans.filter(p => ['BB-FP-01', 'BB-CV-02', 'BB-CV-03'].includes(p.equipmentTag))
    expect(demo.map(p => p.equipmentTag).sort()).toEqual(['BB-CV-02', 'BB-CV-03', 'BB-FP-01'])
    for (const p of demo) {
      const results = (await quality.get(`/api/check-results?planId=${p.id}&pageSize=50`)).body
      expect(results.total).toBeGreaterThanOrEqual(10)
      expect(results.rows.filter((r: { verdict: string }) => r.verdict === 'fail').length).toBe(p.equipmentTag === 'BB-CV-02' ? 1 : 0)
    }
    expect(demo.find(p => p.equipmentTag === 'BB-CV-02')).toMatchObject({ lastCheckedOn: '2026-11-30', lastVerdict: 'fail' })
    const cavity = (await quality.get('/api/sources?q=BB-CV-02')).body.rows[0]
    expect(cavity.status).toBe('out-of-service')
    expect(cavity.statusReason).toMatch(/failed its intermediate check on 2026-11-30.*NC-2026-\d{3}/)
  })
})

describe('the management-review summary', () => {
  it('June 2026, demo only (hand-counted): three checks passed, one satisfactory comparison, nothing else', async () => {
    const r = await quality.get('/api/quality/management-review?from=2026-06-01&to=2026-06-30')
    expect(r.status).toBe(200)
    expect(r.body.counts).toMatchObject({
      checksPerformed: 3, checksFailed: 0, proficiencyResults: 1, proficiencySatisfactory: 1, proficiencyQuestionable: 0,
      nonconformitiesRaised: 0, complaintsReceived: 0, correctiveActionsOpened: 0, runs: 0, certificatesIssued: 0,
    })
    expect(r.body.perMonth).toEqual([{ month: '2026-06', runs: 0, certificates: 0 }])
    expect(r.body.proficiencyResults.map((p: { round: string }) => p.round)).toEqual(['R1'])
    const bad = await quality.get('/api/quality/management-review?from=2026-07-01&to=2026-06-01')
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields).toHaveProperty('to')
  })

  it('exports as a PDF', async () => {
    const r = await pdf(admin, 'from=2026-06-01&to=2026-06-30')
    expect(r.status).toBe(200)
    expect(r.type).toBe('application/pdf')
    expect(r.bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-')
    expect((await pdf(await signedIn('customer'), 'from=2026-06-01&to=2026-06-30')).status).toBe(403)
  })

  // The text is read back with pdftotext (poppler-utils); without it this test is reported as skipped.
  it.skipIf(!hasPdftotext)('the PDF states the counts of the JSON summary, for June 2026 and for the whole year (read with pdftotext)', async () => {
    const june = pdfText((await pdf(quality, 'from=2026-06-01&to=2026-06-30')).bytes)
    expect(june).toContain('Management review summary')
    expect(june).toContain('Intermediate checks performed: 3')
    expect(june).toContain('Proficiency results satisfactory: 1')
    expect(june).toContain('Nonconformities raised: 0')
    expect(june).toContain('2026-06: 0 run(s), 0 certificate(s) issued')
    expect(june).toContain('RT-ILC-2026')
    const year = (await quality.get('/api/quality/management-review?from=2026-01-01&to=2026-12-31')).body
    const text = pdfText((await pdf(quality, 'from=2026-01-01&to=2026-12-31')).bytes)
    expect(year.counts.checksFailed).toBeGreaterThanOrEqual(1) // the demo's BB-CV-02 check
    expect(year.counts.nonconformitiesRaised).toBeGreaterThanOrEqual(1)
    for (const [label, key] of LINES) expect(text, label).toContain(`${label}: ${year.counts[key]}`)
    for (const m of year.perMonth) expect(text).toContain(`${m.month}: ${m.runs} run(s), ${m.certificates} certificate(s) issued`)
    expect(text).toContain('Page 1 of')
  })
})
