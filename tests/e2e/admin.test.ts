import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, shot, signIn } from '../support/browser'
import { BASE_URL, DEMO_ACCOUNTS, unique } from '../support/http'

let browser: Awaited<ReturnType<typeof openBrowser>>
beforeAll(async () => {
  browser = await openBrowser()
  await signIn(browser.page, DEMO_ACCOUNTS.admin)
})
afterAll(async () => {
  await browser?.close()
})

describe('administration pages', () => {
  it('creates a user through the form, showing field errors first', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/admin/users`)
    await page.getByTestId('new-user').click()
    await page.locator('#email').fill('broken')
    await page.locator('#password').fill('short')
    await page.getByTestId('save-user').click()
    // the e-mail's error may already show from leaving its box; the name's shows once the form is checked on saving
    await expect.poll(() => page.locator('[data-field-error="name"]').count()).toBe(1)
    expect(await page.locator('[data-field-error="email"]').count()).toBe(1)
    expect(await page.locator('[data-field-error="password"]').textContent()).toMatch(/12/)
    await shot(page, 'admin-users-errors')

    const email = `${unique('ui')}@bandlight.test`
    await page.locator('#email').fill(email)
    await page.locator('#name').fill('Ines Varga')
    await page.locator('#role').selectOption('customer')
    await page.locator('#organizationId').selectOption({ label: 'Pellucid Float Glass' })
    await page.locator('#password').fill('a-long-enough-password')
    await page.getByTestId('save-user').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toContain(email)

    // Sorting and filtering in the table.
    // (the list is reloaded after the save: wait for the new row, not for any one row — an empty
    // table shows one "Nothing to show" row)
    await page.getByTestId('table-filter').fill('Ines Varga')
    await expect.poll(() => page.locator('tbody tr').first().textContent()).toContain('Ines Varga')
    expect(await page.locator('tbody tr').count()).toBe(1)
    expect(await page.locator('tbody tr').first().textContent()).toContain('Pellucid Float Glass')
    await page.getByTestId('table-filter').fill('')
    await page.getByRole('button', { name: 'Name' }).click()
    await shot(page, 'admin-users')
  })

  it('edits an organization and finds the change in the audit trail', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/admin/organizations`)
    await page.getByTestId('new-organization').click()
    const name = `Quarry Lane Ceramics ${unique()}`
    await page.locator('#name').fill(name)
    await page.locator('#contactEmails').fill('kiln@quarrylane.example\nnot-an-address')
    await page.getByTestId('save-organization').click()
    await expect.poll(() => page.locator('[data-field-error="contactEmails"]').count()).toBe(1)
    await page.locator('#contactEmails').fill('kiln@quarrylane.example')
    await page.getByTestId('save-organization').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toContain(name)
    await shot(page, 'admin-organizations')

    await page.goto(`${BASE_URL}/admin/audit?entity=Organization`)
    await page.waitForSelector('[data-testid="audit-table"] tbody tr')
    const first = await page.locator('[data-testid="audit-table"] tbody tr').first().textContent()
    expect(first).toContain('create')
    await page.locator('[data-testid="audit-table"] tbody tr').first().click()
    await expect.poll(() => page.locator('pre').nth(1).textContent()).toContain(name)
    await shot(page, 'admin-audit')
  })

  it('edits the laboratory settings printed on certificates', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/admin/lab`)
    await page.waitForSelector('[data-testid="lab-form"]')
    await page.locator('#accreditationNumber').fill('')
    await page.getByTestId('save-lab').click()
    await expect.poll(() => page.locator('[data-field-error="accreditationNumber"]').count()).toBe(1)
    await page.locator('#accreditationNumber').fill('NAB-CL-0917')
    await page.locator('#phone').fill('+44 1632 960 734')
    await page.getByTestId('save-lab').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toMatch(/Saved/)
    await shot(page, 'admin-lab')
  })
})
