import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { navFor } from '../../shared/navigation'
import { ROLES, ROLE_LABELS } from '../../shared/roles'
import { openBrowser, shot, signIn } from '../support/browser'
import { BASE_URL, DEMO_ACCOUNTS } from '../support/http'

let browser: Awaited<ReturnType<typeof openBrowser>>
beforeAll(async () => {
  browser = await openBrowser()
})
afterAll(async () => {
  await browser?.close()
})

describe('signing in as each role', () => {
  it('sends an anonymous visitor to the sign-in page and shows a wrong password beside the form', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/admin/users`)
    await page.waitForURL(/\/login/)
    await page.locator('#email').fill('not-an-address')
    await page.getByRole('button', { name: 'Sign in' }).click()
    await expect.poll(() => page.locator('[data-field-error="email"]').textContent()).toMatch(/e-mail/i)
    await page.locator('#email').fill(DEMO_ACCOUNTS.admin)
    await page.locator('#password').fill('wrong-password')
    await page.getByRole('button', { name: 'Sign in' }).click()
    await expect.poll(() => page.getByRole('alert').first().textContent()).toMatch(/not correct/i)
    await shot(page, 'login-error')
  })

  for (const role of ROLES) {
    it(`${role}: sees the ${role}'s navigation, then signs out`, async () => {
      const { page } = browser
      await signIn(page, DEMO_ACCOUNTS[role])
      const links = await page.locator('[data-testid="nav"] a').allTextContents()
      expect(links.map(s => s.trim())).toEqual(navFor(role).map(i => i.label))
      expect(await page.getByTestId('user-role').textContent()).toBe(ROLE_LABELS[role])
      await shot(page, `overview-${role}`)
      if (role !== 'admin') {
        // A page for another role is refused in the page (and the API refuses it anyway).
        await page.goto(`${BASE_URL}/admin/users`)
        await expect.poll(() => page.textContent('body')).toMatch(/403|not available/i)
        await page.goto(`${BASE_URL}/`)
        await page.waitForSelector('[data-testid="nav"]')
      }
      await page.getByTestId('sign-out').click()
      await page.waitForURL(/\/login/)
      await page.goto(`${BASE_URL}/`)
      await page.waitForURL(/\/login/)
    })
  }
})
