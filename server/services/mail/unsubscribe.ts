/** The page a contact sees after following the unsubscribe link of a reminder. */
import { invalidInput } from '#server/utils/errors'
import { unsubscribeByToken } from '#server/services/reminders/reminders'
import { escapeHtml, labIdentity } from './templates'

function page(title: string, message: string, labName: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width"><title>${escapeHtml(title)}</title></head>
<body style="margin:0;background:#f7f4ef;font-family:Helvetica,Arial,sans-serif;color:#2b2620">
<main style="max-width:520px;margin:64px auto;background:#fff;border:1px solid #e4ddd3;border-top:3px solid #d9822b;border-radius:6px;padding:24px 28px">
<h1 style="font-size:20px;margin:0 0 12px">${escapeHtml(title)}</h1><p style="line-height:1.5;margin:0 0 12px">${escapeHtml(message)}</p>
<p style="font-size:13px;color:#6f665c;margin:0">${escapeHtml(labName)}</p></main></body></html>`
}

/**
 * Honour a signed unsubscribe token (the contact stops receiving recalibration reminders, audited)
 * and answer with a small page; 400 naming `token` when it is not valid.
 */
export async function unsubscribePage(token: string): Promise<string> {
  const outcome = await unsubscribeByToken(token)
  if (!outcome) invalidInput({ token: 'Not a valid unsubscribe link' })
  const lab = await labIdentity()
  const email = outcome.contact.email
  return page(
    'You are unsubscribed',
    outcome.changed
      ? `${email} will no longer receive recalibration reminders from us. To receive them again, ask the laboratory.`
      : `${email} was already unsubscribed: no recalibration reminders are sent to this address.`,
    lab.name,
  )
}
