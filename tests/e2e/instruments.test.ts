import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, shot, signIn } from '../support/browser'
import { BASE_URL, DEMO_ACCOUNTS, unique } from '../support/http'

let browser: Awaited<ReturnType<typeof openBrowser>>
beforeAll(async () => {
  browser = await openBrowser()
})
afterAll(async () => {
  await browser?.close()
})

describe('instrument register', () => {
  it('a technician registers an instrument through the form, edits it and sees the change in its history', async () => {
    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.technician)
    await page.goto(`${BASE_URL}/instruments/new`)
    await page.getByTestId('save-instrument').click()
    await expect.poll(() => page.locator('[data-field-error="serial"]').count()).toBe(1)
    expect(await page.locator('[data-field-error="organizationId"]').count()).toBe(1)

    const serial = unique('SN').toUpperCase()
    await page.locator('#organizationId').selectOption({ label: 'Pellucid Float Glass' })
    await page.locator('#serial').fill(serial)
    await page.locator('#maker').fill('Orvane Sensing')
    await page.locator('#model').fill('G5 Glass')
    await page.locator('#kind').selectOption('fixed-pyrometer')
    await page.locator('#bandLambda1Um').fill('5.2')
    await page.locator('#bandLambda2Um').fill('4.8')
    await page.getByTestId('save-instrument').click()
    await expect.poll(() => page.locator('[data-field-error="bandLambda2Um"]').textContent()).toMatch(/above/)
    await page.locator('#bandLambda1Um').fill('4.8')
    await page.locator('#bandLambda2Um').fill('5.2')
    await page.locator('#nextDueDate').fill('2027-03-01')
    await page.getByTestId('save-instrument').click()
    await page.waitForURL(/\/instruments\/\d+$/)
    await expect.poll(() => page.getByTestId('instrument-record').textContent()).toContain('4.8–5.2 µm')
    await page.locator('#photo-file').setInputFiles(path.resolve(import.meta.dirname, '../fixtures/label-1px.png'))
    await expect.poll(() => page.getByTestId('label-photo-img').count()).toBe(1)
    // The image element comes before its bytes: wait for it to load.
    await expect.poll(() => page.getByTestId('label-photo-img').evaluate(img => (img as HTMLImageElement).naturalWidth)).toBe(1)
    await shot(page, 'instrument-detail')

    await page.getByTestId('edit').click()
    await page.locator('#model').fill('G5 Glass Mk2')
    await page.getByTestId('save-instrument').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toContain('Saved')
    await expect.poll(() => page.getByTestId('record-audit').textContent()).toMatch(/update[\s\S]*model/)

    await page.goto(`${BASE_URL}/instruments`)
    await page.getByTestId('search').fill(serial)
    await expect.poll(() => page.getByTestId('row-total').textContent()).toBe('1 record')
    await shot(page, 'instruments-list')
    await page.getByTestId('sign-out').click()
    await page.waitForURL(/\/login/)
  })

  it('a customer sees only its own organization\'s instruments, without lab tools', async () => {
    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.customer)
    await page.goto(`${BASE_URL}/instruments`)
    await page.waitForSelector('tbody tr')
    expect(await page.getByTestId('new-instrument').count()).toBe(0)
    expect(await page.getByTestId('import').count()).toBe(0)
    const text = await page.locator('tbody').textContent()
    expect(text).not.toContain('Pellucid')
    expect(text).not.toContain('Brackenridge')
    await shot(page, 'instruments-customer')
  })
})
