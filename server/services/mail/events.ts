/**
 * Messages for events, queued in the event's own transaction (so the event and its message
 * commit together, and a retried request queues nothing twice): a calibration request received,
 * reviewed (terms to agree) and accepted (to the customer who asked); a certificate issued,
 * amended or withdrawn (to the organization's active contacts and its contact addresses, with the
 * portal link).
 */
import type { Transaction } from 'sequelize'
import type { CalibrationRequest } from '#server/models/CalibrationRequest'
import type { Certificate } from '#server/models/Certificate'
import { Contact } from '#server/models/Contact'
import { Organization } from '#server/models/Organization'
import { User } from '#server/models/User'
import { eventMail, labIdentity } from './templates'
import { queueEventMail } from './outbox'
import { labToday } from '#server/services/settings/today'
import { publicBaseUrl } from '#server/utils/publicUrl'

async function requester(t: Transaction, r: CalibrationRequest) {
  return await User.findByPk(r.requestedBy, { attributes: ['name', 'email'], transaction: t })
}

export async function notifyRequestReceived(t: Transaction, r: CalibrationRequest): Promise<void> {
  const user = await requester(t, r)
  if (!user) return
  const m = eventMail({
    lab: await labIdentity(t),
    subject: `Calibration request ${r.id} received`,
    greeting: `Dear ${user.name},`,
    paragraphs: [`We have received your request ${r.id} for ${r.instrumentIds.length} instrument(s)${r.preferredDate ? `, preferably on ${r.preferredDate}` : ''}. We will confirm a date.`],
    link: { url: `${publicBaseUrl()}/requests`, label: 'Follow your requests' },
  })
  await queueEventMail(t, { kind: 'request-received', to: [user.email], ...m, dedupeKey: `request-${r.id}` })
}

/** The laboratory's terms after reviewing a request, for the customer to agree to in the portal. */
export async function notifyTermsOffered(t: Transaction, r: CalibrationRequest): Promise<void> {
  const user = await requester(t, r)
  if (!user || !r.terms) return
  const m = eventMail({
    lab: await labIdentity(t),
    subject: `Calibration request ${r.id} — terms to agree`,
    greeting: `Dear ${user.name},`,
    paragraphs: [
      `We have reviewed your request ${r.id}. Our terms (procedure ${r.terms.procedureName}, ${r.terms.pointsK.length} calibration point(s), decision rule and specification) are in the portal: please read them and agree to them there, or tell us what should change.`,
      ...(r.terms.message ? [r.terms.message] : []),
    ],
    link: { url: `${publicBaseUrl()}/requests`, label: 'Read and agree to the terms' },
  })
  await queueEventMail(t, { kind: 'request-reviewed', to: [user.email], ...m, dedupeKey: `request-${r.id}-terms-${r.termsVersion}` })
}

export async function notifyRequestAccepted(t: Transaction, r: CalibrationRequest): Promise<void> {
  const user = await requester(t, r)
  if (!user) return
  const m = eventMail({
    lab: await labIdentity(t),
    subject: `Calibration request ${r.id} accepted`,
    greeting: `Dear ${user.name},`,
    paragraphs: [`Your request ${r.id} has been accepted.`, ...(r.response ? [r.response] : [])],
    link: { url: `${publicBaseUrl()}/requests`, label: 'See the request' },
  })
  await queueEventMail(t, { kind: 'request-accepted', to: [user.email], ...m, dedupeKey: `request-${r.id}` })
}

/** The organization's active contacts and contact addresses (null when it has none or is inactive). */
async function organizationRecipients(t: Transaction, organizationId: number): Promise<{ org: Organization, to: string[] } | null> {
  const org = await Organization.findByPk(organizationId, { transaction: t })
  if (!org || !org.active) return null
  const contacts = await Contact.findAll({ where: { organizationId: org.id, active: true }, attributes: ['email'], transaction: t })
  const to = [...new Set([...contacts.map(c => c.email), ...(org.contactEmails ?? [])].map(e => e.toLowerCase()))]
  return to.length ? { org, to } : null
}

export async function notifyCertificateIssued(t: Transaction, cert: Certificate): Promise<void> {
  const rcpt = await organizationRecipients(t, cert.organizationId)
  if (!rcpt) return
  const { org, to } = rcpt
  const m = eventMail({
    lab: await labIdentity(t),
    subject: `Calibration certificate ${cert.number} issued`,
    greeting: `Dear ${org.name},`,
    paragraphs: [`Certificate ${cert.number} for instrument ${cert.instrumentSerial}, calibrated on ${cert.calibrationDate}, has been issued and signed.`, 'You can download it from the customer portal.'],
    link: { url: `${publicBaseUrl()}/certificates/${cert.id}`, label: 'Open the certificate' },
  })
  await queueEventMail(t, { kind: 'certificate-issued', to, ...m, dedupeKey: `certificate-${cert.number}` })
}

/** An amended certificate replaces an earlier one: what changed and why, to the organization's contacts. */
export async function notifyCertificateAmended(t: Transaction, cert: Certificate, replaced: Certificate): Promise<void> {
  const rcpt = await organizationRecipients(t, cert.organizationId)
  if (!rcpt) return
  const m = eventMail({
    lab: await labIdentity(t),
    subject: `Calibration certificate ${replaced.number} replaced by ${cert.number}`,
    greeting: `Dear ${rcpt.org.name},`,
    paragraphs: [
      `Certificate ${replaced.number} for instrument ${cert.instrumentSerial} has been amended. The amended certificate ${cert.number} replaces it; ${replaced.number} is no longer valid.`,
      `Reason: ${cert.amendmentReason ?? '—'}`,
      'The amended certificate states what changed. Please use it in place of the earlier one.',
    ],
    link: { url: `${publicBaseUrl()}/certificates/${cert.id}`, label: 'Open the amended certificate' },
  })
  await queueEventMail(t, { kind: 'certificate-amended', to: rcpt.to, ...m, dedupeKey: `certificate-${cert.number}` })
}

/** A certificate is withdrawn: it is no longer valid, with the reason, to the organization's contacts. */
export async function notifyCertificateWithdrawn(t: Transaction, cert: Certificate): Promise<void> {
  const rcpt = await organizationRecipients(t, cert.organizationId)
  if (!rcpt) return
  const m = eventMail({
    lab: await labIdentity(t),
    subject: `Calibration certificate ${cert.number} withdrawn`,
    greeting: `Dear ${rcpt.org.name},`,
    paragraphs: [
      `Certificate ${cert.number} for instrument ${cert.instrumentSerial} was withdrawn on ${cert.withdrawnAt ? await labToday(cert.withdrawnAt, t) : '—'} and is no longer valid.`,
      `Reason: ${cert.withdrawalReason ?? '—'}`,
      'Please do not rely on it. Contact us about the instrument and any results you based on it.',
    ],
    link: { url: `${publicBaseUrl()}/certificates/${cert.id}`, label: 'See the certificate' },
  })
  await queueEventMail(t, { kind: 'certificate-withdrawn', to: rcpt.to, ...m, dedupeKey: `certificate-${cert.number}` })
}
