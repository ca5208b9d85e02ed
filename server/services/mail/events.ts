/**
 * Messages for events, queued in the event's own transaction (so the event and its message
 * commit together, and a retried request queues nothing twice): a calibration request received
 * and accepted (to the customer who asked), a certificate issued (to the organization's active
 * contacts and its contact addresses, with the portal link).
 */
import type { Transaction } from 'sequelize'
import type { CalibrationRequest } from '#server/models/CalibrationRequest'
import type { Certificate } from '#server/models/Certificate'
import { Contact } from '#server/models/Contact'
import { Organization } from '#server/models/Organization'
import { User } from '#server/models/User'
import { eventMail, labIdentity } from './templates'
import { queueEventMail } from './outbox'
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

export async function notifyCertificateIssued(t: Transaction, cert: Certificate): Promise<void> {
  const org = await Organization.findByPk(cert.organizationId, { transaction: t })
  if (!org || !org.active) return
  const contacts = await Contact.findAll({ where: { organizationId: org.id, active: true }, attributes: ['email'], transaction: t })
  const to = [...new Set([...contacts.map(c => c.email), ...(org.contactEmails ?? [])].map(e => e.toLowerCase()))]
  if (!to.length) return
  const m = eventMail({
    lab: await labIdentity(t),
    subject: `Calibration certificate ${cert.number} issued`,
    greeting: `Dear ${org.name},`,
    paragraphs: [`Certificate ${cert.number} for instrument ${cert.instrumentSerial}, calibrated on ${cert.calibrationDate}, has been issued and signed.`, 'You can download it from the customer portal.'],
    link: { url: `${publicBaseUrl()}/certificates/${cert.id}`, label: 'Open the certificate' },
  })
  await queueEventMail(t, { kind: 'certificate-issued', to, ...m, dedupeKey: `certificate-${cert.number}` })
}
