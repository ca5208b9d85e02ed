// Content detection of uploads by their bytes. Signatures: PDF files begin "%PDF-" (ISO 32000-1
// §7.5.2), PNG with 89 50 4E 47 0D 0A 1A 0A (PNG specification §5.2), JPEG with FF D8 FF (SOI
// marker, ITU-T T.81 Annex B, followed by a marker).
import { describe, expect, it } from 'vitest'
import { detectUploadType, sanitizeFileName, uploadFilePath } from '../../../server/services/uploads/uploads'

describe('detectUploadType', () => {
  it('recognizes PDF, PNG and JPEG by their first bytes, whatever the name', () => {
    expect(detectUploadType(Buffer.from('%PDF-1.7\n%…'))).toBe('application/pdf')
    expect(detectUploadType(Buffer.from([0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A, 0, 0, 0, 13]))).toBe('image/png')
    expect(detectUploadType(Buffer.from([0xFF, 0xD8, 0xFF, 0xE0, 0, 16]))).toBe('image/jpeg')
  })
  it('recognizes CSV as UTF-8 text with at least two columns', () => {
    expect(detectUploadType(Buffer.from('wavelength,response\n8,0.1\n14,0.2\n'))).toBe('text/csv')
    expect(detectUploadType(Buffer.from('µm;R\n8;0.1\n'))).toBe('text/csv')
  })
  it('refuses plain prose, invalid UTF-8 and binary data', () => {
    expect(detectUploadType(Buffer.from('This is a letter, not a certificate.\nRegards'))).toBeNull()
    expect(detectUploadType(Buffer.from([0xC3, 0x28, 0x2C, 0x31]))).toBeNull()
    expect(detectUploadType(Buffer.from([1, 2, 0, 4, 44, 5]))).toBeNull()
    expect(detectUploadType(Buffer.from('%PD'))).toBeNull()
  })
})

describe('file names and paths', () => {
  it('keeps only a display name, never a path', () => {
    expect(sanitizeFileName('../../etc/passwd')).toBe('passwd')
    expect(sanitizeFileName('C:\\certs\\cert "1".pdf')).toBe('cert 1.pdf')
    expect(sanitizeFileName('a\u0000b\nc.png')).toBe('abc.png')
    expect(sanitizeFileName('')).toBe('file')
  })
  it('stores by hash in a two-character folder and refuses anything but a hex digest', () => {
    const sha = 'ab'.padEnd(64, '0')
    expect(uploadFilePath(sha).endsWith(`/ab/${sha}`)).toBe(true)
    expect(() => uploadFilePath('../x')).toThrow()
  })
})
