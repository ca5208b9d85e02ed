/**
 * Messages for events, queued in the event's own transaction (so the event and its message
 * commit together, and a retried request queues nothing twice): a calibration request received,
 * reviewed (terms to agree) and accepted (to the customer who asked); a certificate issued,
 * amended or withdrawn (to the organization's active contacts and its contact addresses, with the
 * portal link); a complaint received and closed (to the complainant); a nonconformity's notice to
 * the customers of the affected work.
 */
import type { Transaction } from 'sequelize'
import type { CalibrationRequest } from '#server/models/CalibrationRequest'
import type { Certificate } from '#server/models/Certificate'
import type { Complaint } from '#server/models/Complaint'
import type { Nonconformity } from '#server/models/Nonconformity'
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
export async function organizationRecipients(t: Transaction, organizationId: number): Promise<{ org: Organization, to: string[] } | null> {
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

/**
 * Who hears about a complaint: the customer user who submitted it in the portal, or — for one the
 * laboratory recorded — the organization's contacts. Null when there is nobody to write to.
 */
async function complainant(t: Transaction, c: Complaint): Promise<{ name: string, to: string[] } | null> {
  if (c.channel === 'portal') {
    const user = await User.findByPk(c.submittedBy, { attributes: ['name', 'email'], transaction: t })
    return user ? { name: user.name, to: [user.email] } : null
  }
  if (!c.organizationId) return null
  const rcpt = await organizationRecipients(t, c.organizationId)
  return rcpt ? { name: rcpt.org.name, to: rcpt.to } : null
}

/** The acknowledgement of a complaint (ISO/IEC 17025 7.9.5); false when there was nobody to write to. */
export async function notifyComplaintReceived(t: Transaction, c: Complaint, about: string | null): Promise<boolean> {
  const who = await complainant(t, c)
  if (!who) return false
  const m = eventMail({
    lab: await labIdentity(t),
    subject: `Complaint ${c.number} received`,
    greeting: `Dear ${who.name},`,
    paragraphs: [
      `We have received your complaint ${c.number}${about ? ` about ${about}` : ''}: “${c.subject}”.`,
      'We will investigate it and tell you the outcome. Someone who was not involved in the work you complain about will review and approve that outcome.',
    ],
    link: { url: `${publicBaseUrl()}/complaints/${c.id}`, label: 'Follow your complaint' },
  })
  return !!(await queueEventMail(t, { kind: 'complaint-received', to: who.to, ...m, dedupeKey: `complaint-${c.number}` }))
}

/** The closing notice of a complaint, with its approved outcome. */
export async function notifyComplaintClosed(t: Transaction, c: Complaint): Promise<boolean> {
  const who = await complainant(t, c)
  if (!who) return false
  const m = eventMail({
    lab: await labIdentity(t),
    subject: `Complaint ${c.number} closed`,
    greeting: `Dear ${who.name},`,
    paragraphs: [
      `We have finished dealing with your complaint ${c.number}: “${c.subject}”.`,
      `Outcome: ${c.outcome ?? '—'}`,
      'If you are not satisfied with this outcome, reply to this message.',
    ],
    link: { url: `${publicBaseUrl()}/complaints/${c.id}`, label: 'See the complaint' },
  })
  return !!(await queueEventMail(t, { kind: 'complaint-closed', to: who.to, ...m, dedupeKey: `complaint-${c.number}` }))
}

/**
 * Tell one customer about a nonconformity affecting work done for it (ISO/IEC 17025 7.10.1 e):
 * the laboratory's message and the certificates concerned. Returns the queued message, or null when
 * the organization has nobody to write to. `sequence` makes each notice of the record distinct.
 */
export async function notifyNonconformity(t: Transaction, nc: Nonconformity, organizationId: number, message: string, certificateNumbers: string[], sequence: number): Promise<{ id: number } | null> {
  const rcpt = await organizationRecipients(t, organizationId)
  if (!rcpt) return null
  const m = eventMail({
    lab: await labIdentity(t),
    subject: `Notice about work done for you: ${nc.number}`,
    greeting: `Dear ${rcpt.org.name},`,
    paragraphs: [
      message,
      ...(certificateNumbers.length ? [`Certificates concerned: ${certificateNumbers.join(', ')}.`] : []),
      `Our reference: ${nc.number}. Please contact us with any question about these results.`,
    ],
  })
  return await queueEventMail(t, { kind: 'nonconformity-notice', to: rcpt.to, ...m, dedupeKey: `${nc.number}-organization-${organizationId}-${sequence}` })
}
