/**
 * Real Chromium (Debian's /usr/bin/chromium) driven by playwright-core. Never a
 * downloaded browser. Screenshots go to tests/.artifacts/screenshots (git-ignored).
 */
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { chromium, type BrowserContext, type Page } from 'playwright-core'
import { BASE_URL, DEMO_PASSWORD } from './http'

export const SCREENSHOTS = path.resolve(import.meta.dirname, '../.artifacts/screenshots')
const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium'

export async function openBrowser(): Promise<{ context: BrowserContext, page: Page, close: () => Promise<void> }> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-chromium-'))
  const context = await chromium.launchPersistentContext(dir, {
    executablePath: CHROMIUM,
    headless: true,
    viewport: { width: 1360, height: 860 },
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  })
  // Every page of every browser test is also a check of the Content-Security-Policy: anything the
  // policy blocks (an inline script without the nonce, eval, a foreign host) fails the test on close.
  const violations: string[] = []
  const watch = (p: Page) => p.on('console', (msg) => {
    if (msg.type() === 'error' && /Content Security Policy/i.test(msg.text())) violations.push(msg.text())
  })
  context.on('page', watch)
  const page = context.pages()[0] ?? (await context.newPage())
  watch(page)
  return {
    context,
    page,
    close: async () => {
      await context.close()
      fs.rmSync(dir, { recursive: true, force: true })
      if (violations.length) throw new Error(`The page broke its Content-Security-Policy:\n${violations.join('\n')}`)
    },
  }
}

export async function shot(page: Page, name: string): Promise<void> {
  fs.mkdirSync(SCREENSHOTS, { recursive: true })
  await page.screenshot({ path: path.join(SCREENSHOTS, `${name}.png`), fullPage: true })
}

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto(`${BASE_URL}/login`)
  await page.locator('#email').fill(email)
  await page.locator('#password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForSelector('[data-testid="nav"]')
}
