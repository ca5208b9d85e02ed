// The certificate PDF builder (server/utils/certificatePdf.ts) from plain data, without a server.
import { execFileSync } from 'node:child_process'
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import zlib from 'node:zlib'
import { describe, expect, it } from 'vitest'
import { certificatePdf, woffToSfnt } from '../../../server/services/certificates/pdf'
import { sampleCertificateData } from '../../../server/services/certificates/sample'
import { hasPdftotext } from '../../support/pdf'

function text(pdf: Buffer): string {
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-pdf-')), 'c.pdf')
  fs.writeFileSync(file, pdf)
  return execFileSync('pdftotext', [file, '-']).toString('utf8').replace(/\s+/g, ' ')
}

describe('certificatePdf', () => {
  it('builds a PDF file', async () => {
    const pdf = await certificatePdf(sampleCertificateData(12, { adjusted: true, revision: 1 }))
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-')
  })

  // The text is read back with pdftotext (poppler-utils); without it the test is reported as skipped.
  it.skipIf(!hasPdftotext)('has the number and page x of y on every page, the content and the end mark (read with pdftotext)', async () => {
    const data = sampleCertificateData(12, { adjusted: true, revision: 1 })
    const pdf = await certificatePdf(data)
    const t = text(pdf)
    const pages = Number(/Page 1 of (\d+)/.exec(t)![1])
    expect(pages).toBeGreaterThanOrEqual(2)
    for (let p = 1; p <= pages; p++) expect(t).toContain(`Page ${p} of ${pages}`)
    expect(t.split('Certificate BL-2026-00042-R1').length - 1).toBe(pages)
    for (const s of ['Calibration Certificate', 'As found (before adjustment)', 'As left (after adjustment)', 'replaces certificate BL-2026-00042',
      'Kestrelmoor Foundry Ltd', 'OT-HT-KF01221', 'HTS-26-0311', 'Quinn Halvorsen', 'authorized for issue', 'End of certificate', '7K2M9 QXP4R', '±1 % of reading']) {
      expect(t, s).toContain(s)
    }
    expect(t.indexOf('End of certificate')).toBeGreaterThan(t.indexOf('Quinn Halvorsen'))
  })

  it('refuses a certificate without points', async () => {
    await expect(certificatePdf({ ...sampleCertificateData(1), points: [] })).rejects.toThrow(/at least one/)
  })
})

describe('woffToSfnt', () => {
  it('unwraps the tables of a WOFF file into an sfnt with the same tables', () => {
    // A one-table WOFF built here (W3C WOFF 1.0 layout): an 'abcd' table of 64 bytes, stored compressed.
    const table = Buffer.from('01234567'.repeat(8))
    const comp = zlib.deflateSync(table)
    const woff = Buffer.alloc(44 + 20 + comp.length)
    woff.write('wOFF', 0, 'latin1')
    woff.writeUInt32BE(0x00010000, 4)
    woff.writeUInt32BE(woff.length, 8)
    woff.writeUInt16BE(1, 12)
    woff.write('abcd', 44, 'latin1')
    woff.writeUInt32BE(64, 48)
    woff.writeUInt32BE(comp.length, 52)
    woff.writeUInt32BE(table.length, 56)
    woff.writeUInt32BE(0x12345678, 60)
    comp.copy(woff, 64)
    const sfnt = woffToSfnt(woff)
    expect(sfnt.readUInt32BE(0)).toBe(0x00010000)
    expect(sfnt.readUInt16BE(4)).toBe(1)
    expect(sfnt.toString('latin1', 12, 16)).toBe('abcd')
    expect(sfnt.readUInt32BE(16)).toBe(0x12345678)
    const offset = sfnt.readUInt32BE(20)
    expect(comp.length).toBeLessThan(table.length)
    expect(sfnt.subarray(offset, offset + sfnt.readUInt32BE(24)).toString()).toBe('01234567'.repeat(8))
  })
})
