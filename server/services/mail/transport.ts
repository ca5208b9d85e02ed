/**
 * Sending one e-mail over SMTP with nodemailer. Configured by `SMTP_URL` (default
 * `smtp://127.0.0.1:2525`, the local mail server of `npm run demo` / `npm run dev`) and
 * `MAIL_FROM`. Plain `smtp://` never upgrades with STARTTLS (the local server offers none);
 * `smtps://` connects with TLS. Messages are never sent from a request: they are queued in the
 * outbox (server/utils/outbox.ts), which calls `deliverMail`. No Nuxt or Nitro imports.
 */
import nodemailer, { type Transporter } from 'nodemailer'

import { config } from '#server/utils/config'

export interface MailConfig {
  smtpUrl: string
  from: string
}

export function mailConfig(): MailConfig {
  return {
    smtpUrl: config().mail.smtpUrl,
    from: config().mail.from,
  }
}

export interface OutgoingMail {
  to: string[]
  subject: string
  text: string
  html: string | null
  /** A stable Message-ID, so a receiver can tell a resend of the same outbox row. */
  messageId?: string
  /** Files sent with the message (an invoice's PDF). */
  attachments?: { filename: string, contentType: string, content: Buffer }[]
}

let cached: { url: string, transport: Transporter } | null = null

/** The nodemailer transport for the current SMTP_URL (created once, re-created when it changes). */
export function mailTransport(): Transporter {
  const { smtpUrl } = mailConfig()
  if (cached?.url === smtpUrl) return cached.transport
  cached?.transport.close()
  const url = new URL(smtpUrl)
  if (url.protocol !== 'smtp:' && url.protocol !== 'smtps:') throw new Error(`SMTP_URL must start with smtp:// or smtps:// (got ${url.protocol})`)
  const secure = url.protocol === 'smtps:'
  const transport = nodemailer.createTransport({
    host: url.hostname,
    port: Number(url.port) || (secure ? 465 : 25),
    secure,
    ignoreTLS: !secure,
    auth: url.username ? { user: decodeURIComponent(url.username), pass: decodeURIComponent(url.password) } : undefined,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 30_000,
  })
  cached = { url: smtpUrl, transport }
  return transport
}

/** Send one message now; throws when the SMTP server refuses it or cannot be reached. */
export async function deliverMail(mail: OutgoingMail): Promise<void> {
  const { from } = mailConfig()
  await mailTransport().sendMail({
    from,
    to: mail.to,
    subject: mail.subject,
    text: mail.text,
    html: mail.html ?? undefined,
    messageId: mail.messageId,
    attachments: mail.attachments?.map(a => ({ filename: a.filename, contentType: a.contentType, content: a.content })),
  })
}

/** The domain of MAIL_FROM, for Message-IDs. */
export function mailDomain(): string {
  const m = /@([^>\s]+)/.exec(mailConfig().from)
  return m?.[1] ?? 'bandlight.test'
}

/** Close the pooled transport (scripts and tests). */
export function closeMailTransport(): void {
  cached?.transport.close()
  cached = null
}
