/**
 * What the local mail server received (demo, development, tests): the JSON files that
 * scripts/lib/mailSink.ts writes into `BANDLIGHT_MAILBOX_DIR`. Unset on a real installation,
 * where the admin Mail page shows the outbox only. Read-only. No Nuxt or Nitro imports.
 */
import fs from 'node:fs'
import path from 'node:path'
import { config } from '#server/utils/config'
import type { Page } from '#shared/types'
import type { ReceivedMessageDTO } from '#shared/types/mail'
import { notFound } from '#server/utils/errors'

export function mailboxDir(): string | null {
  const dir = config().mail.mailboxDir
  return dir ? path.resolve(dir) : null
}

const FILE_RE = /^\d{10,16}-[0-9a-f]{8}\.json$/

function asMessage(raw: unknown, id: string): ReceivedMessageDTO | null {
  if (!raw || typeof raw !== 'object') return null
  const r = raw as Record<string, unknown>
  const str = (v: unknown) => (typeof v === 'string' ? v : '')
  return {
    id,
    from: str(r.from),
    to: Array.isArray(r.to) ? r.to.filter((x): x is string => typeof x === 'string') : [],
    subject: str(r.subject),
    text: str(r.text),
    html: typeof r.html === 'string' ? r.html : null,
    date: str(r.date),
    attachments: Array.isArray(r.attachments)
      ? r.attachments.filter((a): a is Record<string, unknown> => !!a && typeof a === 'object').map(a => ({ filename: str(a.filename), contentType: str(a.contentType), size: typeof a.size === 'number' ? a.size : 0 }))
      : [],
  }
}

/** Received messages, newest first, one page of them, and how many there are. */
export function listReceived(dir: string, page = 1, pageSize = 25): { rows: ReceivedMessageDTO[], total: number } {
  if (!fs.existsSync(dir)) return { rows: [], total: 0 }
  const files = fs.readdirSync(dir).filter(f => FILE_RE.test(f)).sort().reverse()
  const rows: ReceivedMessageDTO[] = []
  for (const f of files.slice((page - 1) * pageSize, page * pageSize)) {
    try {
      const m = asMessage(JSON.parse(fs.readFileSync(path.join(dir, f), 'utf8')), f.replace(/\.json$/, ''))
      if (m) rows.push(m)
    }
    catch {
      // A file that is not a message is left out.
    }
  }
  return { rows, total: files.length }
}

/** What the local mail server received, newest first; 404 when this server has no local mailbox. */
export function receivedMail(page: number, pageSize: number): Page<ReceivedMessageDTO> {
  const dir = mailboxDir()
  if (!dir) notFound('local mailbox: this server sends to a real mail server')
  const { rows, total } = listReceived(dir, page, pageSize)
  return { rows, total, page, pageSize }
}
