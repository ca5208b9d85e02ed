import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, shot, signIn } from '../support/browser'
import { BASE_URL, DEMO_ACCOUNTS, unique } from '../support/http'

let browser: Awaited<ReturnType<typeof openBrowser>>
beforeAll(async () => {
  browser = await openBrowser()
  await signIn(browser.page, DEMO_ACCOUNTS.technician)
})
afterAll(async () => {
  await browser?.close()
})

const TABLE = path.resolve(import.meta.dirname, '../fixtures/responsivity-3-5.csv')

describe('responsivity tables', () => {
  it('stores a table from a CSV file once, and charts its points', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/responsivities`)
    await page.getByTestId('new-responsivity').click()
    await page.getByTestId('save-responsivity').click()
    await expect.poll(() => page.locator('[data-field-error="responsivity-file"]').count()).toBe(1)
    expect(await page.locator('[data-field-error="name"]').count()).toBe(1)

    const name = `MW 3–5 µm detector ${unique()}`
    await page.locator('#responsivity-file').setInputFiles(TABLE)
    await expect.poll(() => page.locator('#name').inputValue()).toBe('responsivity-3-5')
    await page.locator('#name').fill(name)
    await page.getByTestId('save-responsivity').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toContain(`Stored "${name}": 9 points, 2.9–5.2 µm`)
    await page.waitForSelector('[data-testid="responsivity-chart"] canvas')
    expect(await page.getByTestId('responsivity-detail').textContent()).toContain('9 points')
    await shot(page, 'responsivities')

    // The same curve again (another name) is not stored twice.
    await page.getByTestId('new-responsivity').click()
    await page.locator('#responsivity-file').setInputFiles(TABLE)
    await page.locator('#name').fill(`${name} (copy)`)
    await page.getByTestId('save-responsivity').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toContain(`already stored as "${name}"`)
    await page.getByTestId('table-filter').fill(name)
    await expect.poll(() => page.locator('tbody tr').count()).toBe(1)
  })
})
