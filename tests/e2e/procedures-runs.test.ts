import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page as ListPage, ProcedureDetailDTO, RunDTO, SessionUser } from '../../shared/types'
import type { InstrumentDTO } from '../../shared/types/registers'
import { openBrowser, shot, signIn } from '../support/browser'
import { BASE_URL, DEMO_ACCOUNTS, signedIn, unique } from '../support/http'

let browser: Awaited<ReturnType<typeof openBrowser>>
beforeAll(async () => {
  browser = await openBrowser()
})
afterAll(async () => {
  await browser?.close()
})

const procedureName = `Test procedure ${unique('P')}`
let procedureId = 0
let runId = 0
let instrument: InstrumentDTO

describe('procedures: quality writes them, each edit is a new version', () => {
  it('refuses an empty name and a CMC range that ends below its start, then creates version 1', async () => {
    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.quality)
    await page.goto(`${BASE_URL}/procedures`)
    await page.waitForSelector('[data-testid="new-procedure"]')
    await shot(page, 'procedures-list')
    await page.getByTestId('new-procedure').click()
    await page.waitForSelector('[data-testid="procedure-form"]')

    await page.locator('#documentReference').fill('TP-99 issue 1')
    await page.locator('#decisionRule').selectOption('guard-band')
    await page.locator('#guardBandFactor').fill('0.5')
    for (let i = 0; i < 3; i++) await page.getByTestId('add-component').click()

    // 0: the reference thermometer, normal with k = 2
    await page.locator('[data-template-name="0"]').fill('Reference thermometer')
    await page.locator('[data-template-distribution="0"]').selectOption('normal')
    await page.locator('[data-template-value="0"]').fill('0.04')
    await expect.poll(() => page.locator('[data-template-k="0"]').inputValue()).toBe('2')
    // 1: an emissivity input offers only emissivity units
    await page.locator('[data-template-name="1"]').fill('Source emissivity')
    await page.locator('[data-template-input="1"]').selectOption('sourceEmissivity')
    await expect.poll(() => page.locator('[data-template-unit="1"] option').allTextContents()).toEqual(['ε (absolute)', '% of ε'])
    await page.locator('[data-template-value="1"]').fill('0.005')
    // 2: a reading term with finite degrees of freedom, value left empty for now
    await page.locator('[data-template-name="2"]').fill('Size of source')
    await page.locator('[data-template-input="2"]').selectOption('reading')
    expect(await page.locator('[data-template-unit="2"] option').allTextContents()).toEqual(['K', 'mK'])
    await page.locator('[data-template-unit="2"]').selectOption('mK')
    await page.locator('[data-template-distribution="2"]').selectOption('standard')
    await page.locator('[data-template-dof="2"]').fill('8')

    // What it applies to: both kinds of source, 0.5–20 µm, −50 °C to 1500 °C (the setup checks use it).
    await page.locator('[data-source-kind="flat-plate"]').check()
    await page.locator('[data-source-kind="cavity"]').check()
    await page.locator('#appl-band-min').fill('0.5')
    await page.locator('#appl-band-max').fill('20000 nm')
    await page.locator('#appl-min').fill('-50')
    await page.locator('#appl-max').fill('1500')

    await page.getByTestId('add-cmc').click()
    await page.locator('[data-cmc-from="0"]').fill('150')
    await page.locator('[data-cmc-to="0"]').fill('50')
    await page.locator('[data-cmc-u="0"]').fill('0.7')

    await page.getByTestId('save-procedure').click()
    await expect.poll(() => page.locator('[data-field-error="name"]').textContent()).toMatch(/required/i)
    expect(await page.locator('[data-field-error="cmc[0].maxK"]').textContent()).toMatch(/end above its start/)
    expect(await page.locator('[data-field-error="template[2].value"]').textContent()).toMatch(/number/)
    expect(await page.locator('[data-template-value="2"]').getAttribute('aria-invalid')).toBe('true')
    await shot(page, 'procedure-new-errors')

    await page.locator('#name').fill(procedureName)
    await page.locator('[data-template-value="2"]').fill('120')
    await page.locator('[data-cmc-from="0"]').fill('50')
    await page.locator('[data-cmc-to="0"]').fill('150')
    await page.locator('#changeNote').fill('First issue.')
    expect(await page.getByTestId('save-procedure').textContent()).toMatch(/Create procedure/)
    await page.getByTestId('save-procedure').click()
    await page.waitForURL(/\/procedures\/\d+$/)
    procedureId = Number(new URL(page.url()).pathname.split('/').pop())

    const view = page.getByTestId('procedure-version')
    await expect.poll(() => view.getAttribute('data-version')).toBe('1')
    expect(await page.locator('[data-testid="template-table"] tbody tr').count()).toBe(3)
    const rows = await page.locator('[data-testid="template-table"] tbody tr').allTextContents()
    expect(rows[0]).toMatch(/Reference thermometer[\s\S]*Normal[\s\S]*0\.04 K[\s\S]*2/)
    expect(rows[2]).toMatch(/Size of source[\s\S]*120 mK[\s\S]*8/)
    expect(await page.getByTestId('cmc-table').textContent()).toMatch(/50\.00 °C[\s\S]*150\.00 °C[\s\S]*0\.7 K/)
    expect(await page.getByTestId('decision-rule').textContent()).toMatch(/Guarded acceptance[\s\S]*r = 0\.5/)

    // Stored in kelvin, as the server has it.
    const api = await signedIn('quality')
    const stored = await api.get<ProcedureDetailDTO>(`/api/procedures/${procedureId}`)
    expect(stored.status).toBe(200)
    expect(Math.abs(stored.body.currentVersion.cmc[0]!.minK - 323.15)).toBeLessThan(1e-9)
    expect(stored.body.currentVersion.template[2]).toMatchObject({ unit: 'mK', input: 'reading', distribution: 'standard', value: 120, dof: 8, coverageFactor: null })
    expect(stored.body.currentVersion.template[0]).toMatchObject({ distribution: 'normal', coverageFactor: 2, dof: null })
    expect(stored.body.currentVersion.applicability).toMatchObject({ sourceKinds: ['flat-plate', 'cavity'], bandMinUm: 0.5, bandMaxUm: 20 })
    expect(Math.abs(stored.body.currentVersion.applicability!.maxK - 1773.15)).toBeLessThan(1e-9)
  })

  it('edits the procedure as version 2 and still shows version 1 on request', async () => {
    const { page } = browser
    await page.getByTestId('edit').click()
    await page.waitForSelector('[data-testid="procedure-form"]')
    expect((await page.getByTestId('save-procedure').textContent())?.trim()).toBe('Save as version 2')
    await page.locator('[data-template-value="0"]').fill('0.03')
    await page.locator('#changeNote').fill('New reference thermometer certificate.')
    await page.getByTestId('save-procedure').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toMatch(/version 2/)
    await expect.poll(() => page.getByTestId('procedure-version').getAttribute('data-version')).toBe('2')
    expect(await page.locator('[data-testid="template-table"] tbody tr').first().textContent()).toContain('0.03 K')
    expect(await page.locator('[data-version-button]').count()).toBe(2)
    await expect.poll(() => page.getByTestId('record-audit').textContent()).toMatch(/update[\s\S]*create/)
    await shot(page, 'procedure-detail-v2')

    await page.locator('[data-version-button="1"]').click()
    await expect.poll(() => page.getByTestId('procedure-version').getAttribute('data-version')).toBe('1')
    expect(await page.locator('[data-testid="template-table"] tbody tr').first().textContent()).toContain('0.04 K')
    expect(await page.getByTestId('procedure-version').textContent()).toContain('superseded')
    await shot(page, 'procedure-detail-v1')

    await page.goto(`${BASE_URL}/procedures`)
    await page.getByTestId('table-filter').fill(procedureName)
    await expect.poll(() => page.locator('tbody tr').count()).toBe(1)
    expect(await page.locator('tbody tr').first().textContent()).toMatch(/TP-99 issue 1[\s\S]*Guarded acceptance[\s\S]*2[\s\S]*3/)
    await page.getByTestId('sign-out').click()
    await page.waitForURL(/\/login/)
  })
})

describe('runs: a technician starts one', () => {
  it('reads procedures without the means to change them', async () => {
    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.technician)
    await page.goto(`${BASE_URL}/procedures`)
    await page.waitForSelector('[data-testid="table-filter"]')
    expect(await page.getByTestId('new-procedure').count()).toBe(0)
    await page.goto(`${BASE_URL}/procedures/${procedureId}`)
    await page.waitForSelector('[data-testid="procedure-version"]')
    expect(await page.getByTestId('edit').count()).toBe(0)
    expect(await page.getByTestId('read-only-note').count()).toBe(1)
    await shot(page, 'procedure-detail-technician')
    await page.goto(`${BASE_URL}/procedures/new`)
    await expect.poll(() => page.textContent('body')).toMatch(/403|Quality and admin/)
  })

  it('starts a run for a demo instrument and lands on the run', async () => {
    const { page } = browser
    const api = await signedIn('technician')
    const list = await api.get<ListPage<InstrumentDTO>>('/api/instruments?pageSize=50&status=active')
    expect(list.status).toBe(200)
    instrument = list.body.rows.find(i => i.defaultEmissivity !== 1) ?? list.body.rows[0]!

    await page.goto(`${BASE_URL}/runs/new`)
    await page.waitForSelector('[data-testid="run-form"]')
    await page.getByTestId('save-run').click()
    await expect.poll(() => page.locator('[data-field-error="instrumentId"]').textContent()).toMatch(/Choose the instrument/)
    expect(await page.locator('[data-field-error="procedureVersionId"]').textContent()).toMatch(/Choose the procedure/)
    await shot(page, 'run-new-errors')

    await page.getByTestId('instrument-search').fill(instrument.serial)
    await page.locator(`[data-instrument-option="${instrument.serial}"]`).click()
    await expect.poll(() => page.getByTestId('chosen-instrument').textContent()).toContain(instrument.serial)
    // Nothing is pre-filled: the emissivity setting is what was set on the instrument, entered like every condition.
    expect(await page.locator('#emissivitySetting').inputValue()).toBe('')
    const stored = await api.get<ProcedureDetailDTO>(`/api/procedures/${procedureId}`)
    await page.locator('#procedureVersionId').selectOption(String(stored.body.currentVersion.id))
    await page.locator('#calibrationDate').fill('2026-12-02')
    await page.locator('#ambientTemperatureK').fill('22.5')
    // The reflected and instrument temperatures do not follow the ambient one: they are measured.
    expect(await page.locator('#reflectedTemperatureK').inputValue()).toBe('')
    await page.locator('#instrumentTemperatureK').fill('24')
    await page.locator('#relativeHumidityPct').fill('41')
    await page.locator('#emissivitySetting').fill(String(instrument.defaultEmissivity))
    await page.getByTestId('adjusted').check()
    await shot(page, 'run-new-filled')
    await page.getByTestId('save-run').click()
    await page.waitForURL(/\/runs\/\d+$/)
    runId = Number(new URL(page.url()).pathname.split('/').pop())
    expect(runId).toBeGreaterThan(0)

    const me = await api.get<SessionUser>('/api/auth/me')
    const run = await api.get<RunDTO>(`/api/runs/${runId}`)
    expect(run.status).toBe(200)
    expect(run.body).toMatchObject({
      instrumentId: instrument.id,
      procedureVersionId: stored.body.currentVersion.id,
      procedureVersionNumber: 2,
      technicianId: me.body.id,
      receivedDate: null,
      calibrationDate: '2026-12-02',
      relativeHumidityPct: 41,
      // not measured yet, so not recorded
      distanceMm: null,
      reflectedTemperatureK: null,
      emissivitySetting: instrument.defaultEmissivity,
      adjusted: true,
      placeOfCalibration: 'laboratory',
      status: 'draft',
    })
    expect(Math.abs(run.body.ambientTemperatureK! - 295.65)).toBeLessThan(1e-9)
    expect(Math.abs(run.body.instrumentTemperatureK! - 297.15)).toBeLessThan(1e-9)
    // The run page says what is still to be measured.
    await expect.poll(() => page.getByTestId('missing-conditions').textContent()).toMatch(/measuring distance, reflected \(surroundings\) temperature/)
  })

  it('preselects the instrument from the link', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/runs/new?instrumentId=${instrument.id}`)
    await expect.poll(() => page.getByTestId('chosen-instrument').textContent()).toContain(instrument.serial)
    expect(await page.locator('#emissivitySetting').inputValue()).toBe('')
  })

  it('lists the run among the technician\'s own runs', async () => {
    const { page } = browser
    const api = await signedIn('technician')
    const me = (await api.get<SessionUser>('/api/auth/me')).body
    const all = (await api.get<ListPage<RunDTO>>('/api/runs?pageSize=1')).body.total
    const mine = (await api.get<ListPage<RunDTO>>(`/api/runs?pageSize=1&technicianId=${me.id}`)).body.total

    await page.goto(`${BASE_URL}/runs`)
    await page.waitForSelector('[data-testid="row-total"]')
    await expect.poll(() => page.getByTestId('row-total').textContent()).toMatch(new RegExp(`^${all.toLocaleString('en-GB')} records?$`))
    await shot(page, 'runs-list')
    await page.getByTestId('only-mine').check()
    await expect.poll(() => page.getByTestId('row-total').textContent()).toMatch(new RegExp(`^${mine.toLocaleString('en-GB')} records?$`))
    expect(new URL(page.url()).searchParams.get('technicianId')).toBe(String(me.id))
    const technicians = await page.locator('tbody tr td:nth-child(4)').allTextContents()
    expect(technicians.length).toBeGreaterThan(0)
    for (const t of technicians) expect(t.trim()).toBe(me.name)

    // The search is a serial prefix: wait until every row is for a serial that starts with it.
    await page.getByTestId('search').fill(instrument.serial)
    await expect.poll(async () => (await page.locator('tbody tr td:first-child').allTextContents()).every(t => t.startsWith(instrument.serial))).toBe(true)
    expect(await page.locator('tbody tr').allTextContents()).toEqual(expect.arrayContaining([expect.stringContaining(procedureName)]))
    const row = page.locator('tbody tr', { hasText: procedureName }).first()
    expect(await row.textContent()).toMatch(/Draft/)
    expect(await row.textContent()).toContain('2026-12-02')
    await shot(page, 'runs-list-mine')
    await row.click()
    await page.waitForURL(new RegExp(`/runs/${runId}$`))
  })
})
