import type { MailKind, OutboxStatus } from '../schemas/mail'

export interface OutboxMessageDTO {
  id: number
  kind: MailKind
  recipients: string[]
  subject: string
  text: string
  html: string | null
  status: OutboxStatus
  attempts: number
  lastError: string | null
  nextAttemptAt: string | null
  sentAt: string | null
  createdAt: string
  /** Files sent with it (name and type; the bytes stay in the file store). */
  attachments: MailAttachmentDTO[]
}

/** A file sent with a message: its name, type and, for a received message, size in bytes. */
export interface MailAttachmentDTO {
  filename: string
  contentType: string
  size?: number
}

/** A message the local SMTP server (demo, development, tests) received. */
export interface ReceivedMessageDTO {
  id: string
  from: string
  to: string[]
  subject: string
  text: string
  html: string | null
  date: string
  /** Files that came with the message (name, type, size in bytes). */
  attachments?: MailAttachmentDTO[]
}

export interface MailSettingsDTO {
  sendHour: number
  timeZone: string
  leadTimes: number[]
  overdueWeekly: boolean
  version: number
  updatedAt: string
}

export interface ReminderItemDTO {
  /** `instrument`, `source` or `reference`. */
  itemType: string
  itemId: number
  label: string
  detail: string
  dueDate: string
  milestone: string
  dueInWords: string
}

export interface ReminderMessagePlanDTO {
  kind: MailKind
  to: string[]
  subject: string
  items: ReminderItemDTO[]
}

export interface ReminderPreviewDTO {
  /** Lab-local date the plan is for. */
  today: string
  messages: ReminderMessagePlanDTO[]
}

export interface ReminderRunDTO {
  today: string
  /** Outbox rows created by this run. */
  queued: number
  /** Milestones recorded in the reminder log by this run. */
  logged: number
  /** Organizations (or the quality group) skipped because another instance recorded them first. */
  skipped: number
  /** What the sender did straight after. */
  delivery: { sent: number, retried: number, failed: number }
}
