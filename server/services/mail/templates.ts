/**
 * E-mail templates: each message as plain text and as HTML with inline styles only (mail
 * clients drop style sheets), no images, no web fonts, nothing loaded from elsewhere.
 * Every message names the laboratory (`labIdentity()`); customer messages end with the
 * unsubscribe link. No Nuxt or Nitro imports.
 */
import type { Transaction } from 'sequelize'
import { LabSettings } from '#server/models/LabSettings'
import { config } from '#server/utils/config'
import { csvFromRows } from '#server/utils/csv'

export interface LabIdentity {
  name: string
  /** Postal address lines. */
  address: string[]
}

/**
 * The laboratory as messages name it: from the LabSettings row when there is one, otherwise
 * from `LAB_NAME` / `LAB_ADDRESS` (lines separated by `|` or newlines), otherwise invented defaults.
 */
export async function labIdentity(transaction?: Transaction): Promise<LabIdentity> {
  const row = await LabSettings.findOne({ order: [['id', 'ASC']], transaction })
  if (row) {
    const address = [...row.addressLines.split('\n'), [row.postcode, row.city].filter(Boolean).join(' '), row.country]
    return { name: row.name, address: address.map(l => l.trim()).filter(Boolean) }
  }
  const address = (config().lab.address || 'Unit 2, Emberfield Science Park|Cinder Row|Emberfield EF3 9LB|United Kingdom')
    .split(/\||\n/)
    .map(l => l.trim())
    .filter(Boolean)
  return { name: config().lab.name || 'Bandlight Radiation Thermometry Laboratory', address }
}

export interface RenderedMail {
  subject: string
  text: string
  html: string
}

export interface ReminderLine {
  label: string
  detail: string
  dueDate: string
  dueInWords: string
  overdue: boolean
}

export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, c => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', '\'': '&#39;' })[c]!)
}

const FONT = 'font-family:Helvetica,Arial,sans-serif'
const INK = '#2b2620'
const MUTED = '#6f665c'

function htmlPage(lab: LabIdentity, body: string, footer: string): string {
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width"></head>
<body style="margin:0;padding:0;background:#f7f4ef;${FONT};color:${INK}">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="background:#f7f4ef;padding:24px 8px">
<tr><td align="center">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="width:100%;max-width:600px;background:#ffffff;border:1px solid #e4ddd3;border-radius:6px">
<tr><td style="padding:18px 24px;border-bottom:3px solid #d9822b;${FONT};font-size:18px;font-weight:bold;color:${INK}">${escapeHtml(lab.name)}</td></tr>
<tr><td style="padding:20px 24px;${FONT};font-size:15px;line-height:1.5;color:${INK}">${body}</td></tr>
<tr><td style="padding:14px 24px;border-top:1px solid #e4ddd3;${FONT};font-size:12px;line-height:1.5;color:${MUTED}">${escapeHtml(lab.name)}<br>${lab.address.map(escapeHtml).join('<br>')}${footer}</td></tr>
</table>
</td></tr></table>
</body></html>`
}

// A message per contact repeats its group's lines: each list is rendered once (kept while the list lives).
const renderedHtml = new WeakMap<ReminderLine[], Map<string, string>>()
const renderedText = new WeakMap<ReminderLine[], string>()

function linesTableHtml(lines: ReminderLine[], columns: [string, string, string]): string {
  const key = columns.join('\u0000')
  const hit = renderedHtml.get(lines)?.get(key)
  if (hit !== undefined) return hit
  const html = renderLinesTableHtml(lines, columns)
  if (!renderedHtml.has(lines)) renderedHtml.set(lines, new Map())
  renderedHtml.get(lines)!.set(key, html)
  return html
}

function renderLinesTableHtml(lines: ReminderLine[], columns: [string, string, string]): string {
  const th = (s: string) => `<th align="left" style="padding:6px 8px;border-bottom:2px solid #e4ddd3;font-size:13px;color:${MUTED}">${s}</th>`
  const td = (s: string, extra = '') => `<td style="padding:6px 8px;border-bottom:1px solid #efe9e1;font-size:14px;${extra}">${s}</td>`
  const rows = lines.map(l => `<tr>${td(escapeHtml(l.label), 'font-weight:bold')}${td(escapeHtml(l.detail))}${td(`${escapeHtml(l.dueDate)}<br><span style="color:${l.overdue ? '#b42318' : MUTED};font-size:12px">${escapeHtml(l.dueInWords)}</span>`)}</tr>`).join('')
  return `<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="border-collapse:collapse;margin:12px 0">
<tr>${columns.map(th).join('')}</tr>${rows}</table>`
}

function linesText(lines: ReminderLine[]): string {
  const hit = renderedText.get(lines)
  if (hit !== undefined) return hit
  const text = renderLinesText(lines)
  renderedText.set(lines, text)
  return text
}

function renderLinesText(lines: ReminderLine[]): string {
  return lines.map(l => `  - ${l.label} — ${l.detail} — due ${l.dueDate} (${l.dueInWords})`).join('\n')
}

function addressText(lab: LabIdentity): string {
  return [lab.name, ...lab.address].join('\n')
}

/**
 * The most instruments a reminder lists in its body. Web mail clients clip a long message and hide
 * its end, the unsubscribe link with it (Gmail past 102 KB of HTML, from memory); at about 380 bytes
 * a line, 100 lines keep a reminder near 45 KB. A longer list goes whole in an attached CSV file
 * ({@link reminderListCsv}) and the body says how many it shows.
 */
export const REMINDER_BODY_LINES = 100

// The first lines of a long list, one array per list (so the rendered table is cached for every contact).
const headOfList = new WeakMap<ReminderLine[], ReminderLine[]>()

function bodyLines(lines: ReminderLine[]): ReminderLine[] {
  if (lines.length <= REMINDER_BODY_LINES) return lines
  let head = headOfList.get(lines)
  if (!head) {
    head = lines.slice(0, REMINDER_BODY_LINES)
    headOfList.set(lines, head)
  }
  return head
}

/** The whole list of a reminder as CSV (a header row, then one row per instrument, in the body's order). */
export function reminderListCsv(lines: readonly ReminderLine[]): string {
  return csvFromRows(['Serial', 'Instrument', 'Due date', 'Due'], lines.map(l => ({ 'Serial': l.label, 'Instrument': l.detail, 'Due date': l.dueDate, 'Due': l.dueInWords })))
}

/**
 * The recalibration reminder to one customer contact, listing each instrument at a new milestone
 * (most urgent first). A list longer than {@link REMINDER_BODY_LINES} shows its first lines and names
 * `listFile`, the attached CSV file that holds all of them.
 */
export function reminderMail(input: { lab: LabIdentity, contactName: string, organizationName: string, lines: ReminderLine[], unsubscribeUrl: string, listFile?: string }): RenderedMail {
  const { lab, lines } = input
  const n = lines.length
  const shown = bodyLines(lines)
  if (shown.length < n && !input.listFile) throw new Error('A reminder listing more instruments than its body shows needs the attached list')
  const more = shown.length < n ? `The first ${shown.length} of them are listed here; all ${n} are in the attached file ${input.listFile}.` : null
  const anyOverdue = lines.some(l => l.overdue)
  const noun = `${n} instrument${n === 1 ? '' : 's'}`
  const subject = `${anyOverdue ? 'Recalibration overdue' : 'Recalibration due'}: ${noun} — ${input.organizationName}`
  const intro = anyOverdue
    ? `The following ${noun} of ${input.organizationName} ${n === 1 ? 'is' : 'are'} due or overdue for recalibration.`
    : `The following ${noun} of ${input.organizationName} will soon be due for recalibration.`
  const ask = 'To book a calibration, reply to this message or contact the laboratory. Instruments used past their due date may no longer be traceable.'
  const text = `Dear ${input.contactName},

${intro}

${linesText(shown)}
${more ? `\n${more}\n` : ''}
${ask}

Kind regards,
${addressText(lab)}

You receive these reminders as a contact of ${input.organizationName}. To stop them, open:
${input.unsubscribeUrl}
`
  const body = `<p style="margin:0 0 12px">Dear ${escapeHtml(input.contactName)},</p>
<p style="margin:0 0 12px">${escapeHtml(intro)}</p>
${linesTableHtml(shown, ['Serial', 'Instrument', 'Due'])}
${more ? `<p style="margin:12px 0 0">${escapeHtml(more)}</p>\n` : ''}<p style="margin:12px 0 0">${escapeHtml(ask)}</p>`
  const footer = `<br><br>You receive these reminders as a contact of ${escapeHtml(input.organizationName)}. <a href="${escapeHtml(input.unsubscribeUrl)}" style="color:#1f6f78">Stop recalibration reminders</a>`
  return { subject, text, html: htmlPage(lab, body, footer) }
}

/** The alert to one quality manager about the lab's own reference equipment due within 30 days or overdue. */
export function equipmentAlertMail(input: { lab: LabIdentity, userName: string, lines: ReminderLine[] }): RenderedMail {
  const { lab, lines } = input
  const n = lines.length
  const anyOverdue = lines.some(l => l.overdue)
  const subject = `${anyOverdue ? 'Reference equipment overdue' : 'Reference equipment due'}: ${n} item${n === 1 ? '' : 's'}`
  const intro = `The calibration of ${n === 1 ? 'this item' : `these ${n} items`} of reference equipment is due within 30 days or past due. Equipment past its due date must not be used for calibrations until it is recalibrated.`
  const text = `Dear ${input.userName},

${intro}

${linesText(lines)}

${addressText(lab)}
`
  const body = `<p style="margin:0 0 12px">Dear ${escapeHtml(input.userName)},</p>
<p style="margin:0 0 12px">${escapeHtml(intro)}</p>
${linesTableHtml(lines, ['Asset', 'Equipment', 'Due'])}`
  return { subject, text, html: htmlPage(lab, body, '') }
}

/** The alert to one quality manager about actions of corrective actions past their due dates (ISO/IEC 17025 8.7). */
export function qualityAlertMail(input: { lab: LabIdentity, userName: string, lines: ReminderLine[] }): RenderedMail {
  const { lab, lines } = input
  const n = lines.length
  const subject = `Corrective actions overdue: ${n} action${n === 1 ? '' : 's'}`
  const intro = `${n === 1 ? 'This action' : `These ${n} actions`} of corrective actions ${n === 1 ? 'is' : 'are'} past ${n === 1 ? 'its' : 'their'} due date and not marked done. The quality overview lists them with their records.`
  const text = `Dear ${input.userName},

${intro}

${linesText(lines)}

${addressText(lab)}
`
  const body = `<p style="margin:0 0 12px">Dear ${escapeHtml(input.userName)},</p>
<p style="margin:0 0 12px">${escapeHtml(intro)}</p>
${linesTableHtml(lines, ['Corrective action', 'Action (owner)', 'Due'])}`
  return { subject, text, html: htmlPage(lab, body, '') }
}

/** A short event message (request received or accepted, certificate issued) with an optional link. */
export function eventMail(input: { lab: LabIdentity, subject: string, greeting: string, paragraphs: string[], link?: { url: string, label: string } }): RenderedMail {
  const { lab, subject, greeting, paragraphs, link } = input
  const text = [greeting, '', ...paragraphs.flatMap(p => [p, '']), ...(link ? [`${link.label}: ${link.url}`, ''] : []), addressText(lab)].join('\n')
  const body = `<p style="margin:0 0 12px">${escapeHtml(greeting)}</p>${paragraphs.map(p => `<p style="margin:0 0 12px">${escapeHtml(p)}</p>`).join('')}${link ? `<p style="margin:16px 0"><a href="${escapeHtml(link.url)}" style="color:#1d7e75;font-weight:bold">${escapeHtml(link.label)}</a></p>` : ''}`
  return { subject, text, html: htmlPage(lab, body, '') }
}
