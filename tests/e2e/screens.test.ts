// Every page at a wide desktop (1440 px) and a phone (390 px): screenshots to look at
// (tests/.artifacts/screenshots/screen-*-1440.png and -390.png), and at the phone width no page
// may scroll sideways — wide tables scroll inside their own box.
import { beforeAll, describe, expect, it } from 'vitest'
import { DESKTOP, openBrowser, PHONE, pageOverflow, shot, signIn } from '../support/browser'
import { BASE_URL, DEMO_ACCOUNTS, signedIn } from '../support/http'

type Role = keyof typeof DEMO_ACCOUNTS
let pages: { role: Role, name: string, path: string }[] = []

beforeAll(async () => {
  const quality = await signedIn('quality')
  const first = async (url: string) => {
    const body = (await quality.get(url)).body
    return ((Array.isArray(body) ? body[0] : body.rows[0]) as { id: number } | undefined)?.id ?? null
  }
  const [run, certificate, request, instrument, customer, source, reference, procedure] = await Promise.all([
    first('/api/runs?pageSize=1'), first('/api/certificates?pageSize=1'), first('/api/requests?pageSize=1'), first('/api/instruments?pageSize=1'),
    first('/api/customers?pageSize=1'), first('/api/sources?pageSize=1'), first('/api/reference-instruments?pageSize=1'), first('/api/procedures'),
  ])
  // The quality records of the demo (scripts/demo-data/quality.ts): a plan, a comparison, the nonconformity, its corrective action, the complaint.
  const [plan, proficiency, nonconformity, action, complaint] = await Promise.all([
    first('/api/check-plans'), first('/api/proficiency-results?pageSize=1'), first('/api/nonconformities?pageSize=1'), first('/api/corrective-actions?pageSize=1'), first('/api/complaints?pageSize=1'),
  ])
  const customerClient = await signedIn('customer')
  const ownComplaint = ((await customerClient.get('/api/complaints?pageSize=1')).body.rows[0] as { id: number } | undefined)?.id ?? null
  pages = [
    ...[
      ['overview', '/'], ['runs', '/runs'], ['run-new', '/runs/new'], ['run', `/runs/${run}`], ['certificates', '/certificates'], ['certificate', `/certificates/${certificate}`],
      ['requests', '/requests'], ['request', `/requests/${request}`], ['calculator', '/calculator'], ['instruments', '/instruments'], ['instrument-new', '/instruments/new'],
      ['instrument', `/instruments/${instrument}`], ['customers', '/customers'], ['customer-new', '/customers/new'], ['customer', `/customers/${customer}`],
      ['sources', '/sources'], ['source-new', '/sources/new'], ['source', `/sources/${source}`], ['references', '/reference-instruments'],
      ['reference-new', '/reference-instruments/new'], ['reference', `/reference-instruments/${reference}`], ['responsivities', '/responsivities'],
      ['procedures', '/procedures'], ['procedure-new', '/procedures/new'], ['procedure', `/procedures/${procedure}`],
      ['quality', '/quality'], ['checks', '/quality/checks'], ['check-plan', `/quality/checks/${plan}`], ['proficiency', '/quality/proficiency'],
      ['proficiency-result', `/quality/proficiency/${proficiency}`], ['nonconformities', '/quality/nonconformities'], ['nonconformity', `/quality/nonconformities/${nonconformity}`],
      ['actions', '/quality/actions'], ['action', `/quality/actions/${action}`], ['complaints', '/complaints'], ['complaint', `/complaints/${complaint}`],
    ].filter(([, path]) => !path!.endsWith('/null')).map(([name, path]) => ({ role: 'quality' as Role, name: name!, path: path! })),
    ...[['lab', '/admin/lab'], ['users', '/admin/users'], ['organizations', '/admin/organizations'], ['audit', '/admin/audit'], ['mail', '/admin/mail']]
      .map(([name, path]) => ({ role: 'admin' as Role, name: `admin-${name}`, path: path! })),
    ...[['customer-overview', '/'], ['customer-instruments', '/instruments'], ['customer-certificates', '/certificates'], ['customer-requests', '/requests'],
      ['customer-complaints', '/complaints'], ['customer-complaint', `/complaints/${ownComplaint}`]]
      .filter(([, path]) => !path!.endsWith('/null'))
      .map(([name, path]) => ({ role: 'customer' as Role, name: name!, path: path! })),
  ]
})

describe('every page at 1440 px and at 390 px', () => {
  for (const role of ['quality', 'admin', 'customer'] as const) {
    it(`${role}: no page scrolls sideways on a phone`, async () => {
      const browser = await openBrowser(DESKTOP)
      try {
        const { page } = browser
        await signIn(page, DEMO_ACCOUNTS[role])
        const wide: string[] = []
        for (const p of pages.filter(x => x.role === role)) {
          await page.setViewportSize(DESKTOP)
          await page.goto(`${BASE_URL}${p.path}`)
          await page.waitForSelector('main h1')
          await page.waitForTimeout(250)
          await shot(page, `screen-${p.name}-1440`)
          await page.setViewportSize(PHONE)
          await page.waitForTimeout(250)
          await shot(page, `screen-${p.name}-390`)
          const overflow = await pageOverflow(page)
          if (overflow > 0) wide.push(`${p.path} (${overflow} px)`)
        }
        expect(wide, 'pages wider than a phone').toEqual([])
      }
      finally {
        await browser.close()
      }
    })
  }

  it('the public pages too', async () => {
    const browser = await openBrowser(PHONE)
    try {
      const { page } = browser
      for (const path of ['/login', '/verify']) {
        await page.goto(`${BASE_URL}${path}`)
        await page.waitForSelector('h1')
        expect(await pageOverflow(page), path).toBeLessThanOrEqual(0)
        await shot(page, `screen-${path.slice(1)}-390`)
      }
    }
    finally {
      await browser.close()
    }
  })
})
