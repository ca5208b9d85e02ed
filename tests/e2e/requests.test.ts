import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, shot, signIn } from '../support/browser'
import { BASE_URL, DEMO_ACCOUNTS } from '../support/http'

let browser: Awaited<ReturnType<typeof openBrowser>>
beforeAll(async () => {
  browser = await openBrowser()
})
afterAll(async () => {
  await browser?.close()
})

describe('calibration requests in the browser', () => {
  it('a customer sends a request, a technician accepts it into draft runs', async () => {
    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.customer)
    await page.goto(`${BASE_URL}/requests`)
    await page.getByTestId('send-request').click()
    await expect.poll(() => page.locator('[data-field-error="instrumentIds"]').count()).toBe(1)
    const boxes = page.locator('[data-testid="request-form"] input[type="checkbox"]')
    await boxes.nth(0).check()
    await boxes.nth(1).check()
    await page.locator('#notes').fill('Please calibrate before the furnace relining.')
    await page.getByTestId('send-request').click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toMatch(/Request sent/)
    await shot(page, 'requests-customer')
    await page.getByTestId('sign-out').click()
    await page.waitForURL(/\/login/)

    await signIn(page, DEMO_ACCOUNTS.technician)
    await page.goto(`${BASE_URL}/requests`)
    const card = page.locator('[data-request]', { hasText: 'furnace relining' }).first()
    const id = await card.getAttribute('data-request')
    await page.getByTestId(`accept-${id}`).click()
    await page.getByTestId(`confirm-${id}`).click()
    await expect.poll(() => page.getByTestId('notice').textContent()).toMatch(/2 draft run/)
    await shot(page, 'requests-lab')
  })
})
