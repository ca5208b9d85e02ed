/**
 * Signing and issuing certificates: the signatory enters their password again; numbers are
 * allocated gap-free in the issuing transaction; the PDF is stored by its SHA-256 and the data it
 * states is kept on the certificate (`content`), and the digital calibration certificate (DCC XML,
 * ./dcc.ts) built from the same data with the PDF embedded is stored beside it by its SHA-256 too.
 * An issued certificate never changes: an error found
 * later is corrected by reopening — a new revision of the run, a copy that goes through entry,
 * review and signing again — and the amended certificate (-R1, -R2 …) states what changed and why
 * and supersedes the earlier one. Withdrawal keeps the certificate on record; the customer's
 * contacts are told of amendments and withdrawals through the outbox, and the instrument's due date
 * follows its latest valid certificate.
 *
 * Functions named `…In` work inside the caller's transaction; every change writes its audit row there.
 */
import crypto from 'node:crypto'
import type { H3Event } from 'h3'
import { QueryTypes, type Transaction } from 'sequelize'
import { SIGNATURE_MEANING } from '#shared/certificates/constants'
import { addMonths, counterYear, formatCertificateNumber, revisionNumber, verificationCodeFrom } from '#shared/certificates/numbers'
import type { CertificateAmendInput, CertificateIssueInput, CertificateReopenInput, CertificateWithdrawInput } from '#shared/schemas/certificate'
import type { CertificateDetailDTO, RunDetailDTO, SessionUser } from '#shared/types'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { Certificate } from '#server/models/Certificate'
import { CertificateCounter } from '#server/models/CertificateCounter'
import { Instrument } from '#server/models/Instrument'
import { ItemReceipt } from '#server/models/ItemReceipt'
import type { LabSettings } from '#server/models/LabSettings'
import { RunPoint } from '#server/models/RunPoint'
import { User } from '#server/models/User'
import { recordAudit, snapshot, updateAudited } from '#server/utils/audit'
import { onPostgres, sequelize } from '#server/utils/db'
import { conflict, invalidInput, notFound, tooManyRequests, waitInWords } from '#server/utils/errors'
import { passwordMatches } from '#server/utils/password'
import { publicBaseUrl } from '#server/utils/publicUrl'
import { clientAddress } from '#server/utils/request'
import { clearSigningFailures, recordSigningFailure, signingPasswordWait } from '#server/utils/throttle'
import { inTransaction } from '#server/utils/transaction'
import { notifyCertificateAmended, notifyCertificateIssued, notifyCertificateWithdrawn } from '#server/services/mail/events'
import { assertNotWithheld } from '#server/services/nonconformities/withhold'
import { onCertificateChangedIn } from '#server/services/billing/invoices'
import { runDetail } from '#server/services/runs/runs'
import { labSettingsRow, numberFormat } from '#server/services/settings/labSettings'
import { labToday } from '#server/services/settings/today'
import { storeUploadBytes } from '#server/services/uploads/uploads'
import { certificateDetail, certificateFileName } from './certificates'
import { describeChanges, gather } from './content'
import { renderAndStoreDcc } from './dcc'
import { certificatePdf, type CertificateData } from './pdf'

/**
 * The signatory proves it is them by entering their password again. Wrong → 400 naming `password`
 * (the session stays valid); repeated failures → 429, counted per signatory like sign-in's.
 */
export async function verifySigningPassword(event: H3Event, actor: SessionUser, password: string): Promise<User> {
  const address = clientAddress(event)
  const wait = await signingPasswordWait(actor.id, address)
  if (wait > 0) tooManyRequests(event, wait, `Too many wrong passwords. Try again in ${waitInWords(wait)}.`, { password: 'Too many wrong passwords' })
  const user = await User.findByPk(actor.id)
  const ok = !!user && await passwordMatches(user.passwordHash, password)
  if (!user || !ok) {
    await recordSigningFailure(actor.id, address)
    invalidInput({ password: 'The password is not correct: enter your own password to sign' })
  }
  await clearSigningFailures(actor.id, address)
  return user
}

function assertSignatoryFunction(settings: LabSettings, fn: string): string {
  const match = settings.signatoryFunctions.find(f => f.toLowerCase() === fn.trim().toLowerCase())
  if (!match) invalidInput({ signatoryFunction: `Choose one of the laboratory’s signatory functions: ${settings.signatoryFunctions.join(', ')}` })
  return match
}

/** The public address of the laboratory's verification page (env PUBLIC_BASE_URL). */
export function verificationUrl(number: string, code: string): string {
  return `${publicBaseUrl()}/verify?number=${encodeURIComponent(number)}&code=${encodeURIComponent(code)}`
}

function newVerificationCode(): string {
  return verificationCodeFrom(crypto.randomBytes(16))
}

interface StoredFiles {
  pdfSha256: string
  pdfSize: number
  dccSha256: string
  dccSize: number
}

/**
 * Build and store (by SHA-256, like uploads, in the issuing transaction) the files of one revision: the PDF, then the DCC
 * (XML) from the same data with that PDF embedded, the replaced revision named as its previous
 * report, and the engine versions of the certified points.
 */
async function renderAndStore(t: Transaction, data: CertificateData, calibrationDate: string, previous: Certificate | null, points: readonly RunPoint[]): Promise<StoredFiles> {
  const pdf = await certificatePdf(data)
  const pdfSha256 = await storeUploadBytes(pdf, t)
  const dcc = await renderAndStoreDcc({
    content: data,
    certificate: { number: data.number, calibrationDate, issueDate: data.dates.issued },
    pdf: { bytes: pdf, fileName: certificateFileName(data.number, 'pdf') },
    previousReport: previous ? { number: previous.number, pdfSha256: previous.pdfSha256 } : null,
    engineVersions: points.map(p => p.engineVersion),
  }, t)
  return { pdfSha256, pdfSize: pdf.length, dccSha256: dcc.sha256, dccSize: dcc.size }
}

/**
 * Allocate the next sequence of a counter, in the caller's transaction: gap-free, never reused.
 * SQLite: the transaction is BEGIN IMMEDIATE, so no other writer runs until it ends. PostgreSQL:
 * the year's row is created if missing (INSERT … ON CONFLICT DO NOTHING, which waits for a
 * concurrent creator) and then locked (SELECT … FOR UPDATE) until the transaction ends, so
 * concurrent issues on any instance take consecutive numbers one after another.
 */
export async function nextSequenceIn(t: Transaction, year: number): Promise<number> {
  if (onPostgres()) {
    const [created] = await sequelize.query<{ year: number }>(
      'INSERT INTO certificate_counters (year, "lastSequence") VALUES (:year, 1) ON CONFLICT (year) DO NOTHING RETURNING year',
      { replacements: { year }, transaction: t, type: QueryTypes.SELECT },
    )
    if (created) return 1
  }
  // FOR UPDATE on PostgreSQL (SQLite has no row locks and needs none).
  const counter = await CertificateCounter.findByPk(year, { transaction: t, lock: t.LOCK.UPDATE })
  if (!counter) {
    await CertificateCounter.create({ year, lastSequence: 1 }, { transaction: t })
    return 1
  }
  const next = counter.lastSequence + 1
  await CertificateCounter.update({ lastSequence: next }, { where: { year, lastSequence: counter.lastSequence }, transaction: t })
  return next
}

export interface Signer {
  user: User
  signatoryFunction: string
}

/** The valid certificate a revision run corrects (the latest revision of its original's number), or null. */
async function certificateCorrectedBy(t: Transaction | undefined, run: CalibrationRun): Promise<Certificate | null> {
  if (!run.revisionOf) return null
  const original = await Certificate.findOne({ where: { runId: run.revisionOf }, order: [['revision', 'DESC']], transaction: t })
  if (!original) return null
  return Certificate.findOne({ where: { baseNumber: original.baseNumber, status: 'valid' }, transaction: t })
}

/**
 * Issue the certificate of an approved run; the signer's password was checked by the caller. A run
 * that corrects a certificate (a reopened revision) issues the amendment of that certificate.
 * 409 naming the nonconformity when an open one withholds issuing from this run.
 */
export async function issueCertificateIn(t: Transaction, signer: Signer, runId: number, auditAction = 'issue'): Promise<Certificate> {
  // Locked (PostgreSQL) so that two signatories issuing the same run at once cannot both pass the check below.
  const run = await CalibrationRun.findByPk(runId, { transaction: t, lock: t.LOCK.UPDATE })
  if (!run) invalidInput({ runId: 'No run with this id' })
  if (run.status !== 'approved') invalidInput({ runId: 'Only an approved run can be certified: the run must be reviewed and approved first' })
  const existing = await Certificate.findOne({ where: { runId }, transaction: t })
  if (existing) conflict(`The run already has certificate ${existing.number}; reopen it to correct it`, 'runId')
  await assertNotWithheld(t, run)
  if (run.revisionOf) {
    const old = await certificateCorrectedBy(t, run)
    if (!old) conflict('The certificate this run corrects is no longer valid', 'runId')
    return amendWithIn(t, signer, old, run)
  }
  const settings = await labSettingsRow(t)
  const fn = assertSignatoryFunction(settings, signer.signatoryFunction)
  const issuedAt = new Date()
  const issueDate = await labToday(issuedAt, t)
  const g = await gather(t, settings, run, issueDate)
  const format = numberFormat(settings)
  const year = counterYear(format, issuedAt.getUTCFullYear())
  const sequence = await nextSequenceIn(t, year)
  const number = formatCertificateNumber(format, issuedAt.getUTCFullYear(), sequence)
  const code = newVerificationCode()
  const data: CertificateData = {
    ...g.data,
    number,
    revision: 0,
    amends: null,
    signatory: { name: signer.user.name, function: fn, meaning: SIGNATURE_MEANING, signedAt: issuedAt.toISOString() },
    verification: { code, url: verificationUrl(number, code) },
  }
  const files = await renderAndStore(t, data, run.calibrationDate, null, g.points)
  const cert = await Certificate.create({
    number, baseNumber: number, revision: 0, counterYear: year, sequence, status: 'valid',
    runId: run.id, instrumentId: g.instrument.id, organizationId: g.organization.id, instrumentSerial: g.instrument.serial,
    calibrationDate: run.calibrationDate, issueDate, issuedAt,
    signedBy: signer.user.id, signatoryName: signer.user.name, signatoryFunction: fn, signatureMeaning: SIGNATURE_MEANING,
    verificationCode: code, ...files, content: data,
    amendsId: null, amendmentReason: null, supersededById: null, supersededAt: null, withdrawnAt: null, withdrawnBy: null, withdrawalReason: null,
  }, { transaction: t })
  await recordAudit(t, { userId: signer.user.id, action: auditAction, entity: 'Certificate', entityId: cert.id, after: snapshot(cert, ['content']) })
  await followLatestValid(t, signer.user.id, g.instrument.id, cert.number)
  await notifyCertificateIssued(t, cert)
  // An order whose every certificate is now issued is invoiced in this transaction.
  await onCertificateChangedIn(t, cert, 'issue', signer.user.id)
  return cert
}

/**
 * The amendment of `old` from the corrected, approved revision run: the next revision of the same
 * number, stating what changed and why; `old` becomes superseded (its PDF is kept as it was).
 */
async function amendWithIn(t: Transaction, signer: Signer, old: Certificate, run: CalibrationRun): Promise<Certificate> {
  const settings = await labSettingsRow(t)
  const fn = assertSignatoryFunction(settings, signer.signatoryFunction)
  const issuedAt = new Date()
  const issueDate = await labToday(issuedAt, t)
  const g = await gather(t, settings, run, issueDate)
  const oldRun = await CalibrationRun.findByPk(old.runId, { transaction: t })
  const oldPoints = await RunPoint.findAll({ where: { runId: old.runId, voidedAt: null }, order: [['seq', 'ASC']], transaction: t })
  const changes = oldRun ? describeChanges({ run: oldRun, points: oldPoints }, { run, points: g.points }) : []
  const reason = run.revisionReason ?? 'Correction'
  const revision = ((await Certificate.max<number, Certificate>('revision', { where: { baseNumber: old.baseNumber }, transaction: t })) ?? 0) + 1
  const number = revisionNumber(old.baseNumber, revision)
  const code = newVerificationCode()
  const data: CertificateData = {
    ...g.data,
    number,
    revision,
    amends: { number: old.number, issueDate: old.issueDate, reason, changes },
    signatory: { name: signer.user.name, function: fn, meaning: SIGNATURE_MEANING, signedAt: issuedAt.toISOString() },
    verification: { code, url: verificationUrl(number, code) },
  }
  const files = await renderAndStore(t, data, run.calibrationDate, old, g.points)
  const cert = await Certificate.create({
    number, baseNumber: old.baseNumber, revision, counterYear: old.counterYear, sequence: old.sequence, status: 'valid',
    runId: run.id, instrumentId: g.instrument.id, organizationId: g.organization.id, instrumentSerial: g.instrument.serial,
    calibrationDate: run.calibrationDate, issueDate, issuedAt,
    signedBy: signer.user.id, signatoryName: signer.user.name, signatoryFunction: fn, signatureMeaning: SIGNATURE_MEANING,
    verificationCode: code, ...files, content: data,
    amendsId: old.id, amendmentReason: reason, supersededById: null, supersededAt: null, withdrawnAt: null, withdrawnBy: null, withdrawalReason: null,
  }, { transaction: t })
  await updateAudited(t, signer.user, old, { status: 'superseded', supersededById: cert.id, supersededAt: issuedAt }, { entity: 'Certificate', action: 'supersede', omit: ['content'] })
  await recordAudit(t, { userId: signer.user.id, action: 'amend', entity: 'Certificate', entityId: cert.id, after: { ...snapshot(cert, ['content']), reason, changes } })
  await followLatestValid(t, signer.user.id, g.instrument.id, cert.number)
  await notifyCertificateAmended(t, cert, old)
  // Fewer points certified than invoiced: a credit note for the difference.
  await onCertificateChangedIn(t, cert, 'amendment', signer.user.id)
  return cert
}

/**
 * The instrument's next due date follows its latest valid certificate: its calibration date plus
 * the instrument's interval (month-end safe); no valid certificate, no due date from one.
 */
async function followLatestValid(t: Transaction, userId: number, instrumentId: number, because: string): Promise<void> {
  const instrument = await Instrument.findByPk(instrumentId, { transaction: t })
  if (!instrument) return
  const latest = await Certificate.findOne({ where: { instrumentId, status: 'valid', organizationId: instrument.organizationId }, order: [['calibrationDate', 'DESC'], ['id', 'DESC']], transaction: t })
  const due = latest ? addMonths(latest.calibrationDate, instrument.calibrationIntervalMonths) : null
  await updateAudited(t, { id: userId }, instrument, { nextDueDate: due }, { entity: 'Instrument', action: 'certificate-due-date', extra: { certificate: because } })
}

async function findCertificate(t: Transaction, id: number): Promise<Certificate> {
  const cert = await Certificate.findByPk(id, { transaction: t })
  if (!cert) notFound('certificate')
  return cert
}

function assertValid(cert: Certificate, doing: string): void {
  if (cert.status !== 'valid') conflict(`Certificate ${cert.number} is ${cert.status}: only the valid revision can be ${doing}`)
}

/** The open (not void, not yet certified) revision run that corrects this certificate, if any. */
async function openRevisionOf(t: Transaction, cert: Certificate): Promise<CalibrationRun | null> {
  const candidates = await CalibrationRun.findAll({ where: { revisionOf: cert.runId }, order: [['id', 'DESC']], transaction: t })
  for (const r of candidates) {
    if (r.status === 'void') continue
    if (!(await Certificate.count({ where: { runId: r.id }, transaction: t }))) return r
  }
  return null
}

/**
 * Reopen an issued certificate for correction: a new revision of its run — a copy of the header,
 * the receipt and the points (voided ones left out), with the reason — that goes through entry,
 * review and signing again. Its certificate will be the amendment. 409 when one is already open.
 */
export async function reopenCertificateIn(t: Transaction, actor: SessionUser, id: number, input: CertificateReopenInput): Promise<CalibrationRun> {
  const cert = await findCertificate(t, id)
  assertValid(cert, 'reopened')
  const open = await openRevisionOf(t, cert)
  if (open) conflict(`Certificate ${cert.number} is already reopened as run ${open.id}`)
  const source = await CalibrationRun.findByPk(cert.runId, { transaction: t })
  if (!source) notFound('run')
  const { id: _id, createdAt: _c, updatedAt: _u, version: _v, ...header } = source.get({ plain: true })
  const copy = await CalibrationRun.create({
    ...header,
    status: 'draft',
    submittedAt: null,
    reviewerId: null,
    reviewedAt: null,
    reviewComments: null,
    voidedAt: null,
    voidedBy: null,
    voidReason: null,
    revisionOf: source.id,
    revisionReason: input.reason,
    // Reopening copies data others entered; it changes nothing itself.
    contributorIds: [],
    lastReviewedVersion: null,
  }, { transaction: t })
  const receipt = await ItemReceipt.findOne({ where: { runId: source.id }, transaction: t })
  if (receipt) {
    const { id: _rid, runId: _rr, createdAt: _rc, updatedAt: _ru, version: _rv, ...r } = receipt.get({ plain: true })
    await ItemReceipt.create({ ...r, runId: copy.id }, { transaction: t })
  }
  const points = await RunPoint.findAll({ where: { runId: source.id, voidedAt: null }, order: [['seq', 'ASC']], transaction: t })
  for (const p of points) {
    const { id: _pid, runId: _pr, createdAt: _pc, updatedAt: _pu, version: _pv, ...row } = p.get({ plain: true })
    await RunPoint.create({ ...row, runId: copy.id, monteCarlo: null }, { transaction: t })
  }
  await recordAudit(t, { userId: actor.id, action: 'reopen', entity: 'Certificate', entityId: cert.id, after: { certificate: cert.number, revisionRunId: copy.id, reason: input.reason } })
  await recordAudit(t, { userId: actor.id, action: 'create-revision', entity: 'CalibrationRun', entityId: copy.id, after: { ...snapshot(copy), points: points.length } })
  return copy
}

/** Withdraw the valid revision: it stays on record (and downloadable) with status `withdrawn`; the customer is told. */
export async function withdrawCertificateIn(t: Transaction, user: User, id: number, reason: string): Promise<Certificate> {
  const cert = await findCertificate(t, id)
  assertValid(cert, 'withdrawn')
  await updateAudited(t, user, cert, { status: 'withdrawn', withdrawnAt: new Date(), withdrawnBy: user.id, withdrawalReason: reason }, { entity: 'Certificate', action: 'withdraw', omit: ['content'], extra: { reason } })
  await followLatestValid(t, user.id, cert.instrumentId, cert.number)
  await notifyCertificateWithdrawn(t, cert)
  // An invoiced calibration withdrawn is credited.
  await onCertificateChangedIn(t, cert, 'withdrawal', user.id)
  return cert
}

// ---------------------------------------------------------------- the routes' operations (password, then one transaction)

/** Sign and issue the certificate of an approved run (the signatory's password again); an amendment when the run corrects one. */
export async function issueCertificate(event: H3Event, user: SessionUser, input: CertificateIssueInput): Promise<CertificateDetailDTO> {
  const signer = await verifySigningPassword(event, user, input.password)
  const cert = await inTransaction(t => issueCertificateIn(t, { user: signer, signatoryFunction: input.signatoryFunction }, input.runId))
  return certificateDetail(user, cert.id)
}

/**
 * Issue the amendment of a certificate from its corrected, approved revision run (`runId`, or the
 * one open for it); 409 when the certificate was not reopened and corrected first.
 */
export async function amendCertificate(event: H3Event, user: SessionUser, id: number, input: CertificateAmendInput): Promise<CertificateDetailDTO> {
  const signer = await verifySigningPassword(event, user, input.password)
  const cert = await inTransaction(async (t) => {
    const old = await findCertificate(t, id)
    assertValid(old, 'amended')
    const run = input.runId ? await CalibrationRun.findByPk(input.runId, { transaction: t }) : await openRevisionOf(t, old)
    if (!run || run.revisionOf !== old.runId) conflict(`An amendment corrects something: reopen certificate ${old.number}, correct its run and have it approved first`, 'runId')
    if (run.status !== 'approved') conflict(`The corrected run ${run.id} is ${run.status}: it must be reviewed and approved before the amendment is signed`, 'runId')
    return issueCertificateIn(t, { user: signer, signatoryFunction: input.signatoryFunction }, run.id, 'amend')
  })
  return certificateDetail(user, cert.id)
}

/** Reopen a certificate for correction: the new revision run, as the run page shows it. */
export async function reopenCertificate(user: SessionUser, id: number, input: CertificateReopenInput): Promise<RunDetailDTO> {
  const run = await inTransaction(t => reopenCertificateIn(t, user, id, input))
  return runDetail(run.id)
}

/** Withdraw the valid revision, with the reason; it stays on record as withdrawn. */
export async function withdrawCertificate(event: H3Event, user: SessionUser, id: number, input: CertificateWithdrawInput): Promise<CertificateDetailDTO> {
  const signer = await verifySigningPassword(event, user, input.password)
  await inTransaction(t => withdrawCertificateIn(t, signer, id, input.reason))
  return certificateDetail(user, id)
}

/**
 * A preview of the certificate a run would give, before signing (for the technician and the
 * reviewer): watermarked "draft — not valid", no number, no signature, no code. Refused (409)
 * while the record cannot support a certificate yet, naming what is missing.
 */
export async function certificatePreview(runId: number): Promise<Buffer> {
  // Read-only: no transaction (the write queue is not held while the PDF is drawn).
  const t = undefined
  {
    const run = await CalibrationRun.findByPk(runId, { transaction: t })
    if (!run) notFound('run')
    if (run.status === 'void') conflict('The run is void')
    const settings = await labSettingsRow(t)
    const today = await labToday(new Date(), t)
    const g = await gather(t, settings, run, today)
    const old = run.revisionOf ? await certificateCorrectedBy(t, run) : null
    const oldRun = old ? await CalibrationRun.findByPk(old.runId, { transaction: t }) : null
    const oldPoints = old ? await RunPoint.findAll({ where: { runId: old.runId, voidedAt: null }, order: [['seq', 'ASC']], transaction: t }) : []
    return certificatePdf({
      ...g.data,
      draft: true,
      number: 'DRAFT',
      revision: old ? old.revision + 1 : 0,
      amends: old && oldRun ? { number: old.number, issueDate: old.issueDate, reason: run.revisionReason ?? 'Correction', changes: describeChanges({ run: oldRun, points: oldPoints }, { run, points: g.points }) } : null,
      signatory: { name: '—', function: '—', meaning: SIGNATURE_MEANING, signedAt: new Date().toISOString() },
      verification: { code: '0000000000', url: `${publicBaseUrl()}/verify` },
    })
  }
}
