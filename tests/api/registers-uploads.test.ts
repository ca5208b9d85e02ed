// Uploads: type detected by content, size limit, purposes by role, and download scoping.
// File contents are invented; signatures: PDF "%PDF-" (ISO 32000-1 §7.5.2), PNG 89 50 4E 47 0D 0A 1A 0A
// (PNG specification §5.2).
import { describe, expect, it } from 'vitest'
import type { Role } from '../../shared/roles'
import { BASE_URL, DEMO_ACCOUNTS, DEMO_PASSWORD, signedIn, unique } from '../support/http'
import { makeCustomer, makeSource, organizationOf } from '../support/factories'

/** A session cookie for raw multipart requests (the JSON test client sends text bodies only). */
async function cookieFor(role: Role): Promise<string> {
  const res = await fetch(`${BASE_URL}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: DEMO_ACCOUNTS[role], password: DEMO_PASSWORD }) })
  expect(res.status).toBe(200)
  return res.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
}

async function upload(role: Role, file: Uint8Array | string, name: string, type: string, fields: Record<string, string>) {
  const form = new FormData()
  for (const [k, v] of Object.entries(fields)) form.set(k, v)
  form.set('file', new Blob([typeof file === 'string' ? file : new Uint8Array(file)], { type }), name)
  const res = await fetch(`${BASE_URL}/api/uploads`, { method: 'POST', headers: { cookie: await cookieFor(role), accept: 'application/json' }, body: form })
  return { status: res.status, body: await res.json() }
}

async function download(role: Role, id: number) {
  const res = await fetch(`${BASE_URL}/api/uploads/${id}`, { headers: { cookie: await cookieFor(role) } })
  return { status: res.status, headers: res.headers, bytes: new Uint8Array(await res.arrayBuffer()) }
}

const pdf = (text: string) => `%PDF-1.4\n% invented certificate ${text}\n1 0 obj << >> endobj\ntrailer << >>\n%%EOF\n`
const png = (seed: number) => new Uint8Array([0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52, seed & 255, (seed >> 8) & 255, 7, 9])

/** `own`: the demo customer account's organization; `other`: an organization made here. */
async function orgIds(): Promise<{ own: number, other: number }> {
  return { own: await organizationOf(await signedIn('customer')), other: (await makeCustomer(await signedIn('admin'))).id }
}

describe('uploads', () => {
  it('detects the type from the content: a PDF named .png is stored as a PDF; text named .pdf is refused', async () => {
    const r = await upload('quality', pdf(unique()), 'scan.png', 'image/png', { purpose: 'equipment-certificate' })
    expect(r.status).toBe(201)
    expect(r.body).toMatchObject({ mimeType: 'application/pdf', originalName: 'scan.png', purpose: 'equipment-certificate', organizationId: null })
    expect(r.body.sha256).toMatch(/^[0-9a-f]{64}$/)
    const fake = await upload('quality', 'Dear lab, this is not a certificate.', 'certificate.pdf', 'application/pdf', { purpose: 'equipment-certificate' })
    expect(fake.status).toBe(415)
    expect(fake.body.data.fields).toHaveProperty('file')
    const wrongPurpose = await upload('technician', png(1), 'label.png', 'image/png', { purpose: 'responsivity' })
    expect(wrongPurpose.status).toBe(415)
  })

  it('refuses files over the size limit with 413 naming the file, and empty files', async () => {
    const big = new Uint8Array(10 * 1024 * 1024 + 1)
    big.set(new TextEncoder().encode('%PDF-1.4\n'))
    const r = await upload('quality', big, 'big.pdf', 'application/pdf', { purpose: 'equipment-certificate' })
    expect(r.status).toBe(413)
    expect(r.body.data.fields).toHaveProperty('file')
    const empty = await upload('quality', '', 'empty.pdf', 'application/pdf', { purpose: 'equipment-certificate' })
    expect(empty.status).toBe(400)
    expect(empty.body.data.fields).toHaveProperty('file')
  })

  it('checks purpose, role and organization', async () => {
    const { own } = await orgIds()
    expect((await upload('technician', pdf(unique()), 'c.pdf', 'application/pdf', { purpose: 'equipment-certificate' })).status).toBe(403)
    expect((await upload('customer', png(2), 'p.png', 'image/png', { purpose: 'instrument-photo', organizationId: String(own) })).status).toBe(403)
    const noOrg = await upload('technician', png(3), 'p.png', 'image/png', { purpose: 'instrument-photo' })
    expect(noOrg.status).toBe(400)
    expect(noOrg.body.data.fields).toHaveProperty('organizationId')
    const badPurpose = await upload('technician', png(3), 'p.png', 'image/png', { purpose: 'selfie' })
    expect(badPurpose.body.data.fields).toHaveProperty('purpose')
    const csv = await upload('technician', 'wavelengthUm,response\n8,0.1\n14,0.2\n', 'curve.csv', 'text/csv', { purpose: 'responsivity' })
    expect(csv.status).toBe(201)
    expect(csv.body.mimeType).toBe('text/csv')
    const admin = await signedIn('admin')
    const audit = (await admin.get(`/api/admin/audit?entity=Upload&entityId=${csv.body.id}`)).body.rows
    expect(audit.map((a: { action: string }) => a.action)).toEqual(['upload'])
  })

  it('downloads as an attachment: lab roles get everything, a customer only its own instruments\' photos', async () => {
    const { own, other } = await orgIds()
    const tech = await signedIn('technician')
    const cert = (await upload('admin', pdf(unique()), 'cert A.pdf', 'application/pdf', { purpose: 'equipment-certificate' })).body
    const ownPhoto = (await upload('technician', png(Date.now()), 'label.jpg', 'image/jpeg', { purpose: 'instrument-photo', organizationId: String(own) })).body
    const otherPhoto = (await upload('technician', png(Date.now() + 1), 'label.png', 'image/png', { purpose: 'instrument-photo', organizationId: String(other) })).body
    expect(ownPhoto.mimeType).toBe('image/png')

    const inst = { serial: unique('PH-'), maker: 'Ormsby Radiometrics', model: 'Spot 8', kind: 'spot-infrared', bandLambda1Um: 8, bandLambda2Um: 14, rangeMinK: 250, rangeMaxK: 700, defaultEmissivity: 0.95, resolutionK: 0.1, accuracy: { kind: 'absolute', b: 1 }, calibrationIntervalMonths: 12 }
    const wrong = await tech.post('/api/instruments', { ...inst, organizationId: own, photoUploadId: otherPhoto.id })
    expect(wrong.body.data.fields).toHaveProperty('photoUploadId')
    expect((await tech.post('/api/instruments', { ...inst, organizationId: own, photoUploadId: ownPhoto.id })).status).toBe(201)
    await tech.post('/api/instruments', { ...inst, serial: unique('PH-'), organizationId: other, photoUploadId: otherPhoto.id })

    const lab = await download('technician', cert.id)
    expect(lab.status).toBe(200)
    expect(lab.headers.get('content-type')).toBe('application/pdf')
    expect(lab.headers.get('content-disposition')).toBe('attachment; filename="cert A.pdf"; filename*=UTF-8\'\'cert%20A.pdf')
    expect(new TextDecoder().decode(lab.bytes)).toMatch(/^%PDF-1.4/)

    const mine = await download('customer', ownPhoto.id)
    expect(mine.status).toBe(200)
    expect(mine.headers.get('content-type')).toBe('image/png')
    expect(mine.headers.get('content-disposition')).toMatch(/^attachment/)
    expect([...mine.bytes.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A])
    expect((await download('customer', otherPhoto.id)).status).toBe(404)
    expect((await download('customer', cert.id)).status).toBe(404)
    expect((await download('customer', 987654)).status).toBe(404)
  })

  it('attaches an equipment certificate to a calibration, and refuses other uploads there', async () => {
    const quality = await signedIn('quality')
    const { own } = await orgIds()
    const src = await makeSource(quality)
    const cert = (await upload('quality', pdf(unique()), 'cert.pdf', 'application/pdf', { purpose: 'equipment-certificate' })).body
    const photo = (await upload('quality', png(Date.now() + 2), 'p.png', 'image/png', { purpose: 'instrument-photo', organizationId: String(own) })).body
    const cal = { provider: 'Invented Standards Lab', calibrationDate: '2026-11-20', dueDate: '2027-11-20' }
    const bad = await quality.post(`/api/sources/${src.id}/calibrations`, { ...cal, certificateNumber: unique('U-'), uploadId: photo.id })
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields).toHaveProperty('uploadId')
    const ok = await quality.post(`/api/sources/${src.id}/calibrations`, { ...cal, certificateNumber: unique('U-'), uploadId: cert.id })
    expect(ok.status).toBe(201)
    expect(ok.body.uploadId).toBe(cert.id)
  })
})
