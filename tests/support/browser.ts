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

/** A phone (390 × 844 CSS px) and a wide desktop, for the layout checks. */
export const PHONE = { width: 390, height: 844 } as const
export const DESKTOP = { width: 1440, height: 900 } as const

export async function openBrowser(viewport: { width: number, height: number } = { width: 1360, height: 860 }): Promise<{ context: BrowserContext, page: Page, close: () => Promise<void> }> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-chromium-'))
  const context = await chromium.launchPersistentContext(dir, {
    executablePath: CHROMIUM,
    headless: true,
    viewport,
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
  // A click before the page has hydrated would submit the bare HTML form (a reload, no sign-in): let its scripts load first.
  await page.waitForLoadState('networkidle')
  await page.locator('#email').fill(email)
  await page.locator('#password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  // Below 900 px the navigation waits behind the menu button: present, not shown.
  await page.waitForSelector('[data-testid="nav"]', { state: 'attached' })
}

/** Below 900 px: open the navigation with the menu button (a no-op where the rail shows). */
export async function openMenu(page: Page): Promise<void> {
  const button = page.getByTestId('menu-button')
  if (await button.isVisible() && (await button.getAttribute('aria-expanded')) !== 'true') await button.click()
  await page.waitForSelector('[data-testid="nav"]')
}

/** The page's own horizontal overflow: how much wider its content is than the window (0 = none). */
export async function pageOverflow(page: Page): Promise<number> {
  return page.evaluate(() => {
    const el = document.scrollingElement ?? document.documentElement
    return el.scrollWidth - el.clientWidth
  })
}

/** Screenshots of a page at the wide desktop and the phone width, named `<name>-1440` and `<name>-390`. */
export async function shotBoth(page: Page, name: string): Promise<void> {
  const before = page.viewportSize()
  await page.setViewportSize(DESKTOP)
  await page.waitForTimeout(150)
  await shot(page, `${name}-1440`)
  await page.setViewportSize(PHONE)
  await page.waitForTimeout(150)
  await shot(page, `${name}-390`)
  if (before) await page.setViewportSize(before)
}
