// The entry grid keeps its promise: Enter saves the row and the focus is at once in the next row's
// first box; what is typed there while the save is still on its way is all kept.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, shot, signIn } from '../support/browser'
import { makeCustomer, makeInstrument, makeProcedure, makeRun } from '../support/factories'
import { BASE_URL, DEMO_ACCOUNTS, signedIn } from '../support/http'

let browser: Awaited<ReturnType<typeof openBrowser>>
let runId: number

beforeAll(async () => {
  const [tech, quality] = await Promise.all([signedIn('technician'), signedIn('quality')])
  const customer = await makeCustomer(tech)
  const instrument = await makeInstrument(tech, customer.id)
  const procedure = await makeProcedure(quality)
  runId = (await makeRun(tech, instrument.id, procedure.currentVersion.id)).id
  browser = await openBrowser()
  await signIn(browser.page, DEMO_ACCOUNTS.technician)
  await browser.page.locator('[data-unit="C"]').click()
})
afterAll(async () => {
  await browser?.close()
})

const focusedCell = () => browser.page.evaluate(() => {
  const el = document.activeElement as HTMLElement | null
  return { row: el?.closest('tr')?.getAttribute('data-row') ?? null, col: el?.getAttribute('data-col') ?? null }
})

describe('the point grid', () => {
  it('moves on at Enter and keeps every key typed while the save is in flight', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/runs/${runId}`)
    await page.waitForSelector('[data-row="0"]')
    // Every save takes 1.5 s on its way to the server, so typing surely overlaps it.
    await page.route('**/api/runs/*/points', async (route) => {
      await new Promise(r => setTimeout(r, 1500))
      await route.continue()
    })

    const row0 = page.locator('[data-row="0"]')
    await row0.locator('[data-col="source"]').selectOption({ label: 'BB-FP-01' })
    await row0.locator('[data-col="setPoint"]').focus()
    await page.keyboard.type('50')
    await row0.locator('[data-col="indicated"]').focus()
    await page.keyboard.type('50')
    await row0.locator('[data-col="readings"]').focus()
    await page.keyboard.type('49.6 49.7 49.5')
    await page.keyboard.press('Enter')

    // At once: the next row's first box has the focus, while the first row is still being saved.
    await expect.poll(focusedCell, { timeout: 1000 }).toEqual({ row: '1', col: 'setPoint' })
    expect(await page.getByTestId('row-saving').count()).toBe(1)
    await page.keyboard.type('100')
    await page.keyboard.press('Tab') // the source (carried over from the row above)
    await page.keyboard.press('Tab') // where the reference comes from
    await page.keyboard.press('Tab') // the source's indicated temperature
    await page.keyboard.type('100')
    await page.keyboard.press('Tab')
    await page.keyboard.type('99.6 99.7 99.5')
    await shot(page, 'point-grid-typing-during-save')

    // The first save comes back and the results are refreshed: nothing typed in row 2 is lost.
    await expect.poll(() => page.locator('[data-testid="results-table"] tbody tr[data-point]').count(), { timeout: 10_000 }).toBe(1)
    const row1 = page.locator('[data-row="1"]')
    expect(await row1.locator('[data-col="setPoint"]').inputValue()).toBe('100')
    expect(await row1.locator('[data-col="indicated"]').inputValue()).toBe('100')
    expect(await row1.locator('[data-col="readings"]').inputValue()).toBe('99.6 99.7 99.5')
    expect(await row1.locator('[data-col="source"] option:checked').textContent()).toBe('BB-FP-01')

    await page.keyboard.press('Enter')
    await expect.poll(focusedCell, { timeout: 1000 }).toEqual({ row: '2', col: 'setPoint' })
    await expect.poll(() => page.locator('[data-testid="results-table"] tbody tr[data-point]').count(), { timeout: 10_000 }).toBe(2)
    const stored = (await (await signedIn('technician')).get(`/api/runs/${runId}`)).body as { points: { setPointK: number, readingsK: number[] }[] }
    expect(stored.points.map(p => Number((p.setPointK - 273.15).toFixed(6)))).toEqual([50, 100])
    expect(stored.points[1]!.readingsK.map(k => Number((k - 273.15).toFixed(6)))).toEqual([99.6, 99.7, 99.5])
    await page.unroute('**/api/runs/*/points')
    await shot(page, 'point-grid-saved')
  })

  it('a row the schema refuses stays where it is, with the message in words', async () => {
    const { page } = browser
    const row = page.locator('[data-row="2"]')
    await row.locator('[data-col="setPoint"]').fill('abc')
    await row.locator('[data-col="readings"]').press('Enter')
    await expect.poll(() => page.locator('[data-row-error="2"]').textContent()).toContain('Set-point: “abc” is not a number')
    expect(await page.locator('[data-row-error="2"]').textContent()).not.toMatch(/\b[a-z]+[A-Z]\w*\b/)
    expect(await page.locator('[data-row="3"]').count()).toBe(0)
  })
})
