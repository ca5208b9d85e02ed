import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, shot, signIn } from '../support/browser'
import { BASE_URL, DEMO_ACCOUNTS, unique } from '../support/http'

let browser: Awaited<ReturnType<typeof openBrowser>>
let tmp: string
beforeAll(async () => {
  browser = await openBrowser()
  tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-e2e-customers-'))
  await signIn(browser.page, DEMO_ACCOUNTS.technician)
})
afterAll(async () => {
  await browser?.close()
  if (tmp) fs.rmSync(tmp, { recursive: true, force: true })
})

const FIXTURES = path.resolve(import.meta.dirname, '../fixtures')
const run = unique('IMP')
const name = `Harrowgate Enamelware ${unique()}`
let customerId = 0

/** A fixture with the new customer's id and this run's serial prefix filled in. */
function fixture(file: string): string {
  const text = fs.readFileSync(path.join(FIXTURES, file), 'utf8').replaceAll('__ORG__', String(customerId)).replaceAll('__RUN__', run)
  const out = path.join(tmp, file)
  fs.writeFileSync(out, text)
  return out
}

describe('customers', () => {
  it('creates a customer with its certificate address, showing field errors first', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/customers`)
    await page.waitForSelector('[data-testid="row-total"]')
    await shot(page, 'customers-list')
    await page.getByTestId('new-customer').click()
    await page.waitForSelector('[data-testid="customer-form"]')
    await page.getByTestId('save-customer').click()
    for (const f of ['name', 'addressLines', 'city', 'country']) {
      await expect.poll(() => page.locator(`[data-field-error="${f}"]`).count()).toBe(1)
    }
    await shot(page, 'customers-new-errors')
    await page.locator('#name').fill(name)
    await page.locator('#addressLines').fill('Enamel Works, Gate 3\nKilnyard Road 7')
    await page.locator('#city').fill('Harrowgate')
    await page.locator('#postcode').fill('HG7 2KW')
    await page.locator('#country').fill('United Kingdom')
    await page.locator('#contactEmails').fill('certificates@harrowgate-enamel.example')
    await page.getByTestId('save-customer').click()
    await page.waitForURL(/\/customers\/\d+$/)
    customerId = Number(new URL(page.url()).pathname.split('/').pop())
    expect(customerId).toBeGreaterThan(0)
    expect(await page.getByTestId('certificate-address').textContent()).toContain('HG7 2KW Harrowgate')
  })

  it('adds, edits and deactivates contacts', async () => {
    const { page } = browser
    await page.getByTestId('add-contact').click()
    await page.locator('#contact-name').fill('Edwina Pollard')
    await page.locator('#contact-email').fill('edwina@')
    await page.getByTestId('save-contact').click()
    await expect.poll(() => page.locator('[data-field-error="contact-email"]').count()).toBe(1)
    await page.locator('#contact-email').fill('edwina.pollard@harrowgate-enamel.example')
    await page.locator('#contact-phone').fill('+44 1632 960 771')
    await page.getByTestId('save-contact').click()
    await expect.poll(() => page.locator('[data-contact="edwina.pollard@harrowgate-enamel.example"]').count()).toBe(1)

    await page.getByTestId('add-contact').click()
    await page.locator('#contact-name').fill('Rufus Okonjo')
    await page.locator('#contact-email').fill('rufus.okonjo@harrowgate-enamel.example')
    await page.locator('#contact-reminders').uncheck()
    await page.getByTestId('save-contact').click()
    const rufus = page.locator('[data-contact="rufus.okonjo@harrowgate-enamel.example"]')
    await expect.poll(() => rufus.count()).toBe(1)
    expect(await rufus.textContent()).toContain('no')

    // Edit the first contact's phone.
    await page.locator('[data-contact="edwina.pollard@harrowgate-enamel.example"]').getByTestId('edit-contact').click()
    await page.locator('#contact-phone').fill('+44 1632 960 772')
    await page.getByTestId('save-contact').click()
    await expect.poll(() => page.locator('[data-contact="edwina.pollard@harrowgate-enamel.example"]').textContent()).toContain('960 772')

    // Deactivate the second: hidden unless asked for, never deleted.
    await rufus.getByTestId('deactivate-contact').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toMatch(/deactivated/)
    await expect.poll(() => rufus.count()).toBe(0)
    await page.getByText('Show 1 inactive').click()
    await expect.poll(() => rufus.textContent()).toContain('inactive')
    expect(await page.getByTestId('customer-record').textContent()).toMatch(/Active contacts\s*1/)
    await shot(page, 'customer-detail')
  })

  it('imports instruments for the customer: a bad row is shown and blocks the commit until fixed', async () => {
    const { page } = browser
    await page.getByTestId('customer-instruments').click()
    await page.waitForURL(new RegExp(`/instruments\\?.*organizationId=${customerId}`))
    await expect.poll(() => page.getByTestId('row-total').textContent()).toBe('0 records')

    await page.getByTestId('import').click()
    const bad = fixture('instruments-import-bad-row.csv')
    await page.locator('#import-file').setInputFiles(bad)
    await expect.poll(() => page.getByTestId('import-summary').textContent()).toMatch(/2\s*rows ready,\s*1\s*with errors/)
    const preview = await page.getByTestId('import-preview').textContent()
    expect(preview).toContain('defaultEmissivity')
    expect(preview).toMatch(/at most 1/)
    expect(await page.getByTestId('import-commit').isDisabled()).toBe(true)
    // The server refuses the commit too: all rows or none.
    const refused = await page.request.post(`${BASE_URL}/api/instruments/import`, { data: { csv: fs.readFileSync(bad, 'utf8'), commit: true } })
    expect(refused.status()).toBe(400)
    await shot(page, 'instruments-import-errors')

    await page.locator('#import-file').setInputFiles(fixture('instruments-import-fixed.csv'))
    await expect.poll(() => page.getByTestId('import-summary').textContent()).toMatch(/3\s*rows ready,\s*0\s*with errors/)
    await page.getByTestId('import-commit').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toContain('3 instruments imported')
    await expect.poll(() => page.getByTestId('row-total').textContent()).toBe('3 records')
  })

  it('finds an instrument by serial with the search box', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/instruments`)
    await page.waitForSelector('[data-testid="row-total"]')
    await page.getByTestId('search').fill(`${run}-03`)
    await expect.poll(() => page.getByTestId('row-total').textContent()).toMatch(/^1 records?$/)
    const row = await page.locator('tbody tr').first().textContent()
    expect(row).toContain(`${run}-03`)
    expect(row).toContain(name)
    await shot(page, 'instruments-search')
  })
})
