import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, shot, signIn } from '../support/browser'
import { BASE_URL, DEMO_ACCOUNTS } from '../support/http'

let browser: Awaited<ReturnType<typeof openBrowser>>
beforeAll(async () => {
  browser = await openBrowser()
  await signIn(browser.page, DEMO_ACCOUNTS.admin)
})
afterAll(async () => {
  await browser?.close()
})

describe('mail page', () => {
  it('runs reminders, shows the outbox and what the local server received, and opens a message', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/admin/mail`)
    await page.getByTestId('nav').getByRole('link', { name: 'Mail' }).waitFor()
    // A click before the page has hydrated does nothing (the button's handler is not attached yet): let its scripts load first.
    await page.waitForLoadState('networkidle')
    await page.getByTestId('preview-reminders').click()
    await page.getByTestId('reminder-preview').waitFor()
    await page.getByTestId('run-reminders').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toMatch(/Reminders for \d{4}-\d{2}-\d{2}/)
    await expect.poll(() => page.locator('[data-testid="outbox-table"] tbody tr td .badge').count()).toBeGreaterThan(0)
    // The demo's customers have instruments due: their reminders reach the local mail server.
    await page.getByTestId('tab-received').click()
    await expect.poll(async () => {
      await page.waitForTimeout(500)
      return page.locator('[data-testid="received-table"] tbody tr', { hasText: 'kestrelmoor.example' }).filter({ hasText: /Recalibration/ }).count()
    }, { timeout: 15_000 }).toBeGreaterThan(0)
    await page.locator('[data-testid="received-table"] tbody tr', { hasText: 'kestrelmoor.example' }).filter({ hasText: /Recalibration/ }).first().click()
    await page.getByTestId('mail-message').waitFor()
    expect(await page.getByTestId('mail-message-subject').textContent()).toMatch(/Recalibration/)
    const frame = page.getByTestId('mail-message-html')
    expect(await frame.getAttribute('sandbox')).toBe('')
    const inner = page.frameLocator('[data-testid="mail-message-html"]')
    await expect.poll(() => inner.locator('body').textContent()).toContain('Kestrelmoor Foundry Ltd')
    await page.waitForTimeout(400)
    await shot(page, 'admin-mail-received')
    await page.getByRole('tab', { name: 'Plain text' }).click()
    expect(await page.getByTestId('mail-message-text').textContent()).toContain('/api/mail/unsubscribe?token=')
    await page.getByTestId('tab-outbox').click()
    await page.locator('[data-testid="outbox-table"] tbody tr').first().click()
    await page.getByTestId('mail-message').waitFor()
    await page.waitForTimeout(400)
    await shot(page, 'admin-mail-outbox')
  })
})
