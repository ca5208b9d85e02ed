// The layout at the sizes people use: a customer on a phone (390 × 844) goes through the portal
// without the page ever scrolling sideways and downloads a certificate; register rows open from the
// keyboard; at 1440 px the instrument register fits its box; tables scroll in their own box with
// the identifying column pinned.
import fs from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { DESKTOP, openBrowser, openMenu, PHONE, pageOverflow, shot, signIn } from '../support/browser'
import { issueCertificate, makeApprovedRun, makeInstrument, makeProcedure } from '../support/factories'
import { BASE_URL, DEMO_ACCOUNTS, signedIn, type Client } from '../support/http'

let tech: Client
let quality: Client
let serial: string
let certificateNumber: string

beforeAll(async () => {
  ;[tech, quality] = await Promise.all([signedIn('technician'), signedIn('quality')])
  const customer = await signedIn('customer')
  const me = (await customer.get('/api/auth/me')).body as { organizationId: number }
  // The customer's own instrument with a certified calibration, made for this test.
  const instrument = await makeInstrument(tech, me.organizationId)
  serial = instrument.serial as string
  const procedure = await makeProcedure(quality)
  const runId = await makeApprovedRun(tech, quality, instrument.id, procedure.currentVersion.id)
  certificateNumber = (await issueCertificate(quality, runId)).body.number
})

/** The page does not scroll sideways: its content is no wider than the window. */
async function fitsWidth(page: Page, what: string) {
  expect(await pageOverflow(page), `${what} scrolls sideways`).toBeLessThanOrEqual(0)
}

describe('the customer portal on a phone (390 × 844)', () => {
  let browser: Awaited<ReturnType<typeof openBrowser>>
  beforeAll(async () => {
    browser = await openBrowser(PHONE)
  })
  afterAll(async () => {
    await browser?.close()
  })

  it('signs in, opens an instrument, downloads its certificate; no page scrolls sideways', async () => {
    const { page } = browser
    await signIn(page, DEMO_ACCOUNTS.customer)
    // The navigation waits behind the menu button: the page has the whole width.
    expect(await page.getByTestId('nav').isVisible()).toBe(false)
    expect(await page.locator('main').evaluate(m => m.getBoundingClientRect().width)).toBeGreaterThan(350)
    await fitsWidth(page, 'the overview')
    await shot(page, 'phone-overview-390')

    await openMenu(page)
    await shot(page, 'phone-menu-390')
    await page.getByTestId('nav').getByRole('link', { name: 'Instruments' }).click()
    await page.waitForURL(/\/instruments$/)
    expect(await page.getByTestId('nav').isVisible()).toBe(false)
    await page.getByTestId('search').fill(serial)
    await expect.poll(() => page.getByTestId('row-total').textContent()).toBe('1 record')
    await fitsWidth(page, 'the instrument list')
    // The table scrolls in its own box, the serial pinned at the left.
    expect(await page.locator('tbody tr td').first().evaluate(td => getComputedStyle(td).position)).toBe('sticky')
    await shot(page, 'phone-instruments-390')

    await page.locator('tbody tr').first().locator('[data-row-link]').click()
    await page.waitForURL(/\/instruments\/\d+$/)
    await expect.poll(() => page.getByTestId('instrument-history').textContent()).toContain(certificateNumber)
    await fitsWidth(page, 'the instrument page')
    await shot(page, 'phone-instrument-390')

    await page.getByTestId('instrument-history').getByRole('link', { name: certificateNumber }).click()
    await page.waitForURL(/\/certificates\/\d+$/)
    await fitsWidth(page, 'the certificate page')
    await shot(page, 'phone-certificate-390')
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('download-pdf').click()])
    const file = await download.path()
    expect(fs.readFileSync(file).subarray(0, 5).toString('latin1')).toBe('%PDF-')

    for (const path of ['/certificates', '/requests']) {
      await page.goto(`${BASE_URL}${path}`)
      await page.waitForSelector('main h1')
      await fitsWidth(page, path)
      await shot(page, `phone-${path.slice(1)}-390`)
    }
  })
})

describe('keyboard and wide screens', () => {
  let browser: Awaited<ReturnType<typeof openBrowser>>
  beforeAll(async () => {
    browser = await openBrowser(DESKTOP)
    await signIn(browser.page, DEMO_ACCOUNTS.technician)
  })
  afterAll(async () => {
    await browser?.close()
  })

  it('Tab reaches a register row\'s link and Enter opens the record', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/instruments`)
    await page.waitForSelector('tbody [data-row-link]')
    await page.locator('body').click({ position: { x: 1, y: 1 } })
    let onRow = false
    for (let i = 0; i < 80 && !onRow; i++) {
      await page.keyboard.press('Tab')
      onRow = await page.evaluate(() => document.activeElement?.hasAttribute('data-row-link') ?? false)
    }
    expect(onRow, 'Tab never reached a row link').toBe(true)
    const target = await page.evaluate(() => (document.activeElement as HTMLAnchorElement).getAttribute('href'))
    expect(target).toMatch(/^\/instruments\/\d+$/)
    await page.keyboard.press('Enter')
    await page.waitForURL(new RegExp(`${target}$`))
    await page.waitForSelector('[data-testid="instrument-record"]')
  })

  it('at 1440 px the instrument register fits its box: "Next due" and "Status" need no sideways scrolling', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/instruments`)
    await page.waitForSelector('tbody [data-row-link]')
    const box = page.locator('.table-box').first()
    const { scroll, client } = await box.evaluate(el => ({ scroll: el.scrollWidth, client: el.clientWidth }))
    expect(scroll, `the table is ${scroll - client} px wider than its box`).toBeLessThanOrEqual(client)
    for (const header of ['Next due', 'Status']) {
      const th = page.locator('thead th', { hasText: header })
      const [thBox, tableBox] = await Promise.all([th.boundingBox(), box.boundingBox()])
      expect(thBox!.x + thBox!.width).toBeLessThanOrEqual(tableBox!.x + tableBox!.width + 0.5)
    }
    await fitsWidth(page, 'the instrument register')
    await shot(page, 'instruments-1440')
  })

  it('the unit preference survives a reload and is used by the server render', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/instruments`)
    await page.locator('[data-unit="F"]').click()
    await expect.poll(() => page.locator('thead').textContent()).toContain('°F')
    // The server's own HTML (before any script runs) already speaks °F.
    const html = await (await page.request.get(`${BASE_URL}/instruments`)).text()
    expect(html).toContain('Range / °F')
    await page.reload()
    await page.waitForSelector('tbody [data-row-link]')
    expect(await page.locator('[data-unit="F"]').getAttribute('aria-checked')).toBe('true')
    await page.locator('[data-unit="C"]').click()
    await expect.poll(() => page.locator('thead').textContent()).toContain('°C')
  })
})
