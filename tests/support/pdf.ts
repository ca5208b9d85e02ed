/**
 * Reading a PDF's text back with pdftotext (poppler-utils), for the tests that check what a
 * certificate or report states. Without pdftotext those checks are reported as skipped
 * (`it.skipIf(!hasPdftotext)`), never passed silently.
 */
import { execFileSync } from 'node:child_process'
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'

export const hasPdftotext = (() => {
  try {
    execFileSync('which', ['pdftotext'], { stdio: 'ignore' })
    return true
  }
  catch {
    return false
  }
})()

/**
 * The text of a PDF with its words joined by single spaces, so a phrase is found whatever line it
 * was broken over. `keepAs` also keeps the file under that path (e.g. for a look with pdftoppm).
 */
export function pdfText(bytes: Buffer, keepAs?: string): string {
  const file = keepAs ?? path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-pdf-')), 'file.pdf')
  fs.mkdirSync(path.dirname(file), { recursive: true })
  fs.writeFileSync(file, bytes)
  return execFileSync('pdftotext', [file, '-']).toString('utf8').replace(/\s+/g, ' ')
}
