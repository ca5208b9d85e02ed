/**
 * A local SMTP server for the demo, development and tests: it accepts every message on
 * 127.0.0.1 (never another interface), without authentication or STARTTLS, and keeps each one
 * as a JSON file in `dir` — `{ id, from, to, subject, text, html, date, messageId, attachments }` — written
 * under a temporary name and renamed, so a reader never sees half a message. Framework-free:
 * `npm run demo`, `npm run dev` and the test runner start it; the admin Mail page reads the
 * folder (server/utils/mailbox.ts) when the server is given BANDLIGHT_MAILBOX_DIR.
 */
import crypto from 'node:crypto'
import fs from 'node:fs'
import path from 'node:path'
import { simpleParser, type AddressObject } from 'mailparser'
import { SMTPServer } from 'smtp-server'

export interface MailSink {
  port: number
  dir: string
  close(): Promise<void>
}

export interface StoredMessage {
  id: string
  from: string
  to: string[]
  subject: string
  text: string
  html: string | null
  date: string
  messageId: string | null
  /** Files that came with the message: name, type and size (the bytes are not kept). */
  attachments: { filename: string, contentType: string, size: number }[]
}

function addressText(a: AddressObject | AddressObject[] | undefined): string {
  if (!a) return ''
  return (Array.isArray(a) ? a : [a]).map(x => x.text).join(', ')
}

export async function startMailSink(opts: { port: number, dir: string, quiet?: boolean }): Promise<MailSink> {
  fs.mkdirSync(opts.dir, { recursive: true })
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    banner: 'Bandlight local mail sink',
    size: 10 * 1024 * 1024,
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const date = new Date()
          const id = `${date.getTime()}-${crypto.randomBytes(4).toString('hex')}`
          const message: StoredMessage = {
            id,
            from: addressText(parsed.from) || (session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
            to: session.envelope.rcptTo.map(r => r.address),
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? parsed.html : null,
            date: date.toISOString(),
            messageId: parsed.messageId ?? null,
            attachments: parsed.attachments.map(a => ({ filename: a.filename ?? '', contentType: a.contentType, size: a.size })),
          }
          const file = path.join(opts.dir, `${id}.json`)
          fs.writeFileSync(`${file}.part`, JSON.stringify(message, null, 2))
          fs.renameSync(`${file}.part`, file)
          if (!opts.quiet) console.log(`[mail sink] ${message.subject} → ${message.to.join(', ')}`)
          callback()
        })
        .catch(err => callback(err as Error))
    },
  })
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(opts.port, '127.0.0.1', () => {
      server.off('error', reject)
      resolve()
    })
  })
  server.on('error', err => console.error('[mail sink]', err.message))
  const address = server.server.address()
  const port = typeof address === 'object' && address ? address.port : opts.port
  return {
    port,
    dir: opts.dir,
    close: () => new Promise<void>(resolve => server.close(() => resolve())),
  }
}
