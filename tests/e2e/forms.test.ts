// Forms speak the user's words: messages name the field's label and give values in the unit the
// user chose; quantities may be typed with their own unit; letters in a number box are refused
// with a message instead of vanishing; a refusal of the server lands under the field at fault.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, shot, signIn } from '../support/browser'
import { makeCustomer, makeInstrument } from '../support/factories'
import { BASE_URL, DEMO_ACCOUNTS, signedIn } from '../support/http'

let browser: Awaited<ReturnType<typeof openBrowser>>
beforeAll(async () => {
  browser = await openBrowser()
  await signIn(browser.page, DEMO_ACCOUNTS.technician)
})
afterAll(async () => {
  await browser?.close()
})

const error = (field: string) => browser.page.locator(`[data-field-error="${field}"]`)

describe('the words of the forms', () => {
  it('refuses letters and wrong units in a temperature box, and reads a typed unit', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/runs/new`)
    await page.locator('[data-unit="C"]').click()
    await page.reload()
    await page.waitForSelector('[data-testid="run-form"]')
    const ambient = page.locator('#ambientTemperatureK')
    await ambient.fill('abc')
    await ambient.blur()
    await expect.poll(() => error('ambientTemperatureK').textContent()).toBe('Ambient temperature: “abc” is not a number')
    expect(await ambient.inputValue()).toBe('abc')
    await ambient.fill('25 m')
    await ambient.blur()
    await expect.poll(() => error('ambientTemperatureK').textContent()).toBe('Ambient temperature: °C expected, got m')
    // 298.15 K is 25 °C (SI Brochure §2.3.1): the box shows it in its own unit.
    await ambient.fill('298.15 K')
    await ambient.blur()
    await expect.poll(() => ambient.inputValue()).toBe('25')
    await expect.poll(() => error('ambientTemperatureK').count()).toBe(0)
    // 0.3 m in a box of millimetres.
    await page.locator('#distanceMm').fill('0.3 m')
    await page.locator('#distanceMm').blur()
    await expect.poll(() => page.locator('#distanceMm').inputValue()).toBe('300')
    await shot(page, 'forms-units')
  })

  it('gives a bound in the unit the user works in, with the field\'s label', async () => {
    const { page } = browser
    await page.goto(`${BASE_URL}/instruments/new`)
    await page.waitForSelector('[data-testid="instrument-form"]')
    await page.locator('#rangeMaxK').fill('9000')
    await page.getByTestId('save-instrument').click()
    // The schema's limit is 5000 K = 4726.85 °C.
    await expect.poll(() => error('rangeMaxK').textContent()).toBe('Range to must be at most 4726.85 °C')
    await expect.poll(() => error('organizationId').textContent()).toBe('Choose the customer')
    for (const text of await page.locator('[data-field-error]').allTextContents()) expect(text).not.toMatch(/\b[a-z]+[A-Z]\w*\b/)
    // A wavelength may be typed in nm.
    await page.locator('#bandLambda1Um').fill('7900 nm')
    await page.locator('#bandLambda1Um').blur()
    await expect.poll(() => page.locator('#bandLambda1Um').inputValue()).toBe('7.9')
    await shot(page, 'forms-bounds')
  })

  it('a duplicate serial (409) is marked on the serial field, not the customer', async () => {
    const { page } = browser
    const lab = await signedIn('technician')
    const customer = await makeCustomer(lab)
    const first = await makeInstrument(lab, customer.id)
    await page.goto(`${BASE_URL}/instruments/new`)
    await page.waitForSelector('[data-testid="instrument-form"]')
    await page.locator('#organizationId').selectOption(String(customer.id))
    await page.locator('#serial').fill(first.serial as string)
    await page.locator('#maker').fill(first.maker as string)
    await page.locator('#model').fill(first.model as string)
    await page.getByTestId('save-instrument').click()
    await expect.poll(() => error('serial').count()).toBe(1)
    expect(await error('organizationId').count()).toBe(0)
    await shot(page, 'forms-duplicate-serial')
  })
})
