/**
 * The outbox: every e-mail is first a row (`OutboxMessage`), written in the transaction of the
 * change that caused it; `sendQueued` delivers queued rows. Delivery is at least once and, with
 * the claim below, once in practice:
 *
 * - a sender claims a row with one conditional UPDATE (`… WHERE id = ? AND status = 'queued' AND
 *   (claimedUntil IS NULL OR claimedUntil < now)`) and sends it only when that UPDATE changed one
 *   row, so two server instances (or two overlapping runs) never send the same row;
 * - a failure keeps the row queued with attempts + 1, the error, and the next attempt after a
 *   back-off of 1 min · 2^(attempts − 1), at most 4 h (1, 2, 4 … 128, 240, 240 … min); after 14
 *   attempts — just over 24 h of trying — it is `failed`, and an administrator can queue it again
 *   ({@link requeueMessage});
 * - a sender that dies mid-send leaves a claim that expires after CLAIM_MS, and the row is tried again.
 *
 * No Nuxt or Nitro imports: the Nitro plugin (server/plugins/mailSender.ts), the admin routes,
 * the tests and the benchmark all call these functions.
 */
import { Op, type Transaction, type WhereOptions } from 'sequelize'
import type { MailKind, OutboxQuery } from '#shared/schemas/mail'
import type { Page } from '#shared/types'
import type { OutboxMessageDTO } from '#shared/types/mail'
import { conflict, notFound } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'
import { OutboxMessage, type MailAttachment } from '#server/models/OutboxMessage'
import { contentHash, fileStore } from '#server/utils/fileStore'
import { recordAudit } from '#server/utils/audit'
import { INSTANCE_ID } from '#server/utils/instance'
import { deliverMail, mailDomain, type OutgoingMail } from './transport'

export const MAX_ATTEMPTS = 14
export const BASE_BACKOFF_MS = 60_000
export const MAX_BACKOFF_MS = 4 * 60 * 60_000
/** How long a claim holds: longer than any one SMTP exchange (socket timeout 30 s). */
export const CLAIM_MS = 120_000
const BATCH = 50

/** This process, as it signs its claims. */
export { INSTANCE_ID }

export interface QueueInput {
  kind: MailKind
  to: string[]
  subject: string
  text: string
  html: string | null
  /** Unique per message: queuing the same key again is refused by the database. */
  dedupeKey: string
  /** Stored files to send with it (read from the file store when the message is sent). */
  attachments?: MailAttachment[]
}

/** Queue one message inside the caller's transaction. */
export async function queueMail(t: Transaction, input: QueueInput): Promise<OutboxMessage> {
  if (!input.to.length) throw new Error('A message needs at least one recipient')
  return OutboxMessage.create({
    kind: input.kind,
    recipients: input.to,
    subject: input.subject,
    text: input.text,
    html: input.html,
    dedupeKey: input.dedupeKey,
    attachments: input.attachments?.length ? input.attachments : null,
    status: 'queued',
    attempts: 0,
    nextAttemptAt: new Date(),
  }, { transaction: t })
}

export interface EventMailInput {
  kind: Exclude<MailKind, 'reminder' | 'equipment-alert' | 'quality-alert' | 'invoice-overdue'>
  to: string[]
  subject: string
  text: string
  html: string | null
  dedupeKey: string
  attachments?: MailAttachment[]
}

/**
 * Queue the message for an event (a calibration request received or accepted, a certificate
 * issued with its portal link) in the event's own transaction, so the event and its message
 * commit together. Returns null, and queues nothing, when a message with the same dedupeKey is
 * already in the outbox (the event was handled before). Checked before inserting, inside the
 * transaction: SQLite transactions here are BEGIN IMMEDIATE, so no other writer runs in between; on
 * PostgreSQL a concurrent second copy fails on the unique dedupeKey and its transaction rolls back.
 */
export async function queueEventMail(t: Transaction, input: EventMailInput): Promise<OutboxMessage | null> {
  const key = `${input.kind}:${input.dedupeKey}`
  if (await OutboxMessage.findOne({ where: { dedupeKey: key }, attributes: ['id'], transaction: t })) return null
  return queueMail(t, { ...input, dedupeKey: key })
}

export function backoffMs(attempts: number): number {
  return Math.min(MAX_BACKOFF_MS, BASE_BACKOFF_MS * 2 ** Math.max(0, attempts - 1))
}

/**
 * Queue a message that failed for good again (an administrator's decision, e.g. after a long mail
 * outage): attempts start again from zero. Audited in the caller's transaction; `requeued` is
 * false (and nothing changes) unless the message had failed.
 */
export async function requeueMessage(t: Transaction, actorId: number, id: number): Promise<{ row: OutboxMessage, requeued: boolean } | null> {
  const row = await OutboxMessage.findByPk(id, { transaction: t })
  if (!row) return null
  if (row.status !== 'failed') return { row, requeued: false }
  const before = { status: row.status, attempts: row.attempts, lastError: row.lastError }
  row.set({ status: 'queued', attempts: 0, nextAttemptAt: new Date(), claimedBy: null, claimedUntil: null })
  await row.save({ transaction: t })
  await recordAudit(t, { userId: actorId, action: 'requeue', entity: 'OutboxMessage', entityId: row.id, before, after: { status: row.status, attempts: row.attempts } })
  return { row, requeued: true }
}

export interface SendResult {
  sent: number
  /** Failed this time, queued again for later. */
  retried: number
  /** Failed for the last time. */
  failed: number
}

export interface SendOptions {
  now?: Date
  instanceId?: string
  limit?: number
  /** Replaces SMTP delivery (tests). */
  deliver?: (mail: OutgoingMail) => Promise<void>
}

/** The bytes of an attachment, checked against their hash (a missing or damaged file fails the attempt, which is retried). */
async function attachmentBytes(sha256: string): Promise<Buffer> {
  const data = await fileStore().get(sha256)
  if (!data || contentHash(data) !== sha256) throw new Error(`attachment ${sha256} is missing from the file store`)
  return data
}

/** Claim one queued row for this sender; true only when this call took it. */
export async function claimMessage(id: number, instanceId: string, now: Date): Promise<boolean> {
  const [changed] = await OutboxMessage.update(
    { claimedBy: instanceId, claimedUntil: new Date(now.getTime() + CLAIM_MS) },
    {
      where: {
        id,
        status: 'queued',
        [Op.or]: [{ claimedUntil: null }, { claimedUntil: { [Op.lt]: now } }],
      },
    },
  )
  return changed === 1
}

/** Deliver the queued messages whose next attempt is due, oldest first. */
export async function sendQueued(opts: SendOptions = {}): Promise<SendResult> {
  const now = opts.now ?? new Date()
  const instanceId = opts.instanceId ?? INSTANCE_ID
  const deliver = opts.deliver ?? deliverMail
  const result: SendResult = { sent: 0, retried: 0, failed: 0 }
  const due = await OutboxMessage.findAll({
    where: {
      status: 'queued',
      [Op.and]: [
        { [Op.or]: [{ nextAttemptAt: null }, { nextAttemptAt: { [Op.lte]: now } }] },
        { [Op.or]: [{ claimedUntil: null }, { claimedUntil: { [Op.lt]: now } }] },
      ],
    },
    order: [['nextAttemptAt', 'ASC'], ['id', 'ASC']],
    limit: opts.limit ?? BATCH,
  })
  for (const row of due) {
    if (!(await claimMessage(row.id, instanceId, now))) continue
    const mine = { id: row.id, claimedBy: instanceId }
    try {
      const attachments = row.attachments?.length
        ? await Promise.all(row.attachments.map(async a => ({ filename: a.filename, contentType: a.contentType, content: await attachmentBytes(a.sha256) })))
        : undefined
      await deliver({ to: row.recipients, subject: row.subject, text: row.text, html: row.html, messageId: `<outbox-${row.id}@${mailDomain()}>`, attachments })
      await OutboxMessage.update(
        { status: 'sent', sentAt: new Date(), attempts: row.attempts + 1, lastError: null, claimedBy: null, claimedUntil: null },
        { where: mine },
      )
      result.sent++
    }
    catch (err) {
      const attempts = row.attempts + 1
      const last = attempts >= MAX_ATTEMPTS
      await OutboxMessage.update(
        {
          status: last ? 'failed' : 'queued',
          attempts,
          lastError: String((err as Error)?.message ?? err).slice(0, 1000),
          nextAttemptAt: last ? null : new Date(now.getTime() + backoffMs(attempts)),
          claimedBy: null,
          claimedUntil: null,
        },
        { where: mine },
      )
      if (last) result.failed++
      else result.retried++
    }
  }
  return result
}

/** The outbox as the Mail page shows it: newest first, paged, by status or kind. */
export async function listOutbox(q: OutboxQuery): Promise<Page<OutboxMessageDTO>> {
  const where: WhereOptions<OutboxMessage> = {}
  if (q.status) where.status = q.status
  if (q.kind) where.kind = q.kind
  const { rows, count } = await OutboxMessage.findAndCountAll({ where, order: [['createdAt', 'DESC'], ['id', 'DESC']], limit: q.pageSize, offset: (q.page - 1) * q.pageSize })
  return { rows: rows.map(outboxDTO), total: count, page: q.page, pageSize: q.pageSize }
}

/** Queue a failed message again (the administrator's "Queue again"); 404 / 409 when it cannot be. */
export async function requeueFailedMessage(actor: { id: number }, id: number): Promise<OutboxMessageDTO> {
  const done = await inTransaction(t => requeueMessage(t, actor.id, id))
  if (!done) notFound('message')
  if (!done.requeued) conflict(`Only a failed message can be queued again; this one is ${done.row.status}`)
  return outboxDTO(done.row)
}

export function outboxDTO(row: OutboxMessage): OutboxMessageDTO {
  return {
    id: row.id,
    kind: row.kind,
    recipients: row.recipients,
    subject: row.subject,
    text: row.text,
    html: row.html,
    status: row.status,
    attempts: row.attempts,
    lastError: row.lastError ?? null,
    nextAttemptAt: row.nextAttemptAt ? row.nextAttemptAt.toISOString() : null,
    sentAt: row.sentAt ? row.sentAt.toISOString() : null,
    createdAt: row.createdAt.toISOString(),
    attachments: (row.attachments ?? []).map(a => ({ filename: a.filename, contentType: a.contentType })),
  }
}
