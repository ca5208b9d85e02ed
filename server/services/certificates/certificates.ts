/**
 * Certificates: the laboratory settings, signing (the signatory enters their password again),
 * gap-free numbering, the PDF stored by its SHA-256, amendment and withdrawal, the lists and the
 * public verification. The PDF itself is built by certificatePdf.ts from the plain data gathered
 * here (`certificateData`), and that data is kept on the certificate row (`content`).
 *
 * Functions named `…In` work inside the caller's transaction; every change writes its audit row there.
 */
import crypto from 'node:crypto'
import { createError, type H3Event } from 'h3'
import { Op, type Transaction } from 'sequelize'
import { COVERAGE_PROBABILITY, DECISION_RULE_LABELS } from '#shared/calibration/constants'
import { SIGNATURE_MEANING } from '#shared/certificates/constants'
import { addMonths, counterYear, formatCertificateNumber, revisionNumber, verificationCodeFrom } from '#shared/certificates/numbers'
import { describeAccuracy, describeBand } from '#shared/format'
import { INSTRUMENT_KIND_LABELS, REFERENCE_KIND_LABELS, SOURCE_KIND_LABELS } from '#shared/registers/constants'
import type { CertificateAmendInput, CertificateIssueInput, CertificateQuery, CertificateWithdrawInput } from '#shared/schemas/certificate'
import type { CertificateDTO, CertificateDetailDTO, Page, SessionUser } from '#shared/types'
import { BlackbodySource } from '#server/models/BlackbodySource'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { Certificate } from '#server/models/Certificate'
import { CertificateCounter } from '#server/models/CertificateCounter'
import { Instrument } from '#server/models/Instrument'
import type { LabSettings } from '#server/models/LabSettings'
import { Organization } from '#server/models/Organization'
import { ProcedureVersion } from '#server/models/ProcedureVersion'
import { ReferenceInstrument } from '#server/models/ReferenceInstrument'
import { RunPoint } from '#server/models/RunPoint'
import { SpectralResponse } from '#server/models/SpectralResponse'
import { User } from '#server/models/User'
import { notFound, invalidInput, tooManyRequests, waitInWords } from '#server/utils/errors'
import { organizationScope } from '#server/utils/access'
import { recordAudit, snapshot } from '#server/utils/audit'
import { certificatePdf, type CertificateData, type CertificateEquipment } from './pdf'
import { calibrationsOf } from '#server/services/equipment/calibrations'
import { ListFilter } from '#server/utils/search'
import { clientAddress } from '#server/utils/request'
import { clearSigningFailures, recordSigningFailure, signingPasswordWait } from '#server/utils/throttle'
import { storeUploadBytes, type StoredFile } from '#server/services/uploads/uploads'
import { notifyCertificateIssued } from '#server/services/mail/events'
import { publicBaseUrl } from '#server/utils/publicUrl'
import { passwordMatches } from '#server/utils/password'
import { labSettingsRow, numberFormat } from '#server/services/settings/labSettings'
import { labToday } from '#server/services/settings/today'
import { inTransaction } from '#server/utils/transaction'

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

// ---------------------------------------------------------------- data of a certificate

/** The public address of the laboratory's verification page (env PUBLIC_BASE_URL). */
export function verificationUrl(number: string, code: string): string {
  return `${publicBaseUrl()}/verify?number=${encodeURIComponent(number)}&code=${encodeURIComponent(code)}`
}

function newVerificationCode(): string {
  return verificationCodeFrom(crypto.randomBytes(16))
}

const lines = (s: string | null | undefined) => (s ?? '').split(/\r?\n/).map(l => l.trim()).filter(Boolean)

const c1 = (k: number) => `${(k - 273.15).toFixed(1).replace(/^-/, '−')} °C`

interface Gathered {
  run: CalibrationRun
  instrument: Instrument
  organization: Organization
  data: Omit<CertificateData, 'number' | 'revision' | 'amends' | 'signatory' | 'verification'>
}

/** Everything a certificate of this run states, from the records (in the transaction). */
async function gather(t: Transaction, settings: LabSettings, run: CalibrationRun, issueDate: string): Promise<Gathered> {
  const instrument = await Instrument.findByPk(run.instrumentId, { transaction: t })
  if (!instrument) invalidInput({ runId: 'The run’s instrument no longer exists' })
  const organization = await Organization.findByPk(instrument.organizationId, { transaction: t })
  if (!organization) invalidInput({ runId: 'The instrument’s customer no longer exists' })
  const pv = await ProcedureVersion.findByPk(run.procedureVersionId, { transaction: t })
  if (!pv) invalidInput({ runId: 'The run’s procedure version no longer exists' })
  const table = instrument.spectralResponseId ? await SpectralResponse.findByPk(instrument.spectralResponseId, { transaction: t }) : null
  const points = await RunPoint.findAll({ where: { runId: run.id }, order: [['seq', 'ASC']], transaction: t })
  if (!points.length) invalidInput({ runId: 'The run has no points' })

  const sourceIds = [...new Set(points.map(p => p.sourceId))]
  const refIds = [...new Set(points.map(p => p.referenceInstrumentId).filter((v): v is number => !!v))]
  const [sources, refs, sourceCals, refCals] = await Promise.all([
    BlackbodySource.findAll({ where: { id: sourceIds }, transaction: t }),
    refIds.length ? ReferenceInstrument.findAll({ where: { id: refIds }, transaction: t }) : [],
    calibrationsOf('source', sourceIds, t),
    calibrationsOf('reference', refIds, t),
  ])
  // The external calibration in force on the calibration date (the latest one before it).
  const inForce = (list: { calibrationDate: string, certificateNumber: string, provider: string }[] | undefined) =>
    (list ?? []).find(c => c.calibrationDate <= run.calibrationDate) ?? null
  const equipment: CertificateEquipment[] = [
    ...sources.map((s) => {
      const c = inForce(sourceCals.get(s.id))
      return { role: `Blackbody source (${SOURCE_KIND_LABELS[s.kind].toLowerCase()})`, assetTag: s.assetTag, description: `${s.maker} ${s.model}, serial ${s.serial}`, certificateNumber: c?.certificateNumber ?? null, provider: c?.provider ?? null, calibrationDate: c?.calibrationDate ?? null }
    }),
    ...refs.map((r) => {
      const c = inForce(refCals.get(r.id))
      return { role: REFERENCE_KIND_LABELS[r.kind] ?? 'Reference instrument', assetTag: r.assetTag, description: `${r.maker} ${r.model}, serial ${r.serial}`, certificateNumber: c?.certificateNumber ?? null, provider: c?.provider ?? null, calibrationDate: c?.calibrationDate ?? null }
    }),
  ]

  const first = points[0]!.result
  const rule = pv.decisionRule
  const guardBandText = rule === 'simple-acceptance' ? '' : `r = ${pv.guardBandFactor ?? 1}`
  const customerAddress = [...lines(organization.addressLines), [organization.postcode, organization.city].filter(Boolean).join(' '), organization.country ?? ''].filter(Boolean)
  const labAddress = [...lines(settings.addressLines), [settings.postcode, settings.city].filter(Boolean).join(' '), settings.country].filter(Boolean)
  return {
    run,
    instrument,
    organization,
    data: {
      lab: { name: settings.name, addressLines: labAddress, email: settings.email ?? null, phone: settings.phone ?? null, accreditationBody: settings.accreditationBody, accreditationNumber: settings.accreditationNumber },
      customer: { name: organization.name, addressLines: customerAddress },
      instrument: {
        maker: instrument.maker,
        model: instrument.model,
        serial: instrument.serial,
        assetTag: instrument.assetTag ?? null,
        kind: INSTRUMENT_KIND_LABELS[instrument.kind] ?? instrument.kind,
        band: describeBand({ bandLambda1Um: instrument.bandLambda1Um, bandLambda2Um: instrument.bandLambda2Um, spectralResponseName: table?.name ?? null }),
        rangeText: `${c1(instrument.rangeMinK)} to ${c1(instrument.rangeMaxK)}`,
        resolutionText: `${instrument.resolutionK} °C`,
        accuracyText: describeAccuracy(instrument.accuracy),
        condition: run.adjusted ? 'Adjusted during the calibration: results are given as found and as left.' : 'No defect recorded on receipt; not adjusted.',
      },
      method: { procedureName: pv.name, documentReference: pv.documentReference, versionNumber: pv.versionNumber },
      dates: { received: run.receivedDate, calibrated: run.calibrationDate, issued: issueDate },
      environment: {
        ambientK: run.ambientTemperatureK,
        relativeHumidityPct: run.relativeHumidityPct,
        distanceMm: run.distanceMm,
        emissivitySetting: run.emissivitySetting,
        reflectedK: run.reflectedTemperatureK,
        instrumentK: run.instrumentTemperatureK,
      },
      adjusted: !!run.adjusted,
      points: points.map(p => ({
        stage: p.stage,
        referenceK: p.result.referenceTemperatureK,
        expectedK: p.result.expectedReadingK,
        meanK: p.result.meanReadingK,
        errorK: p.result.errorK,
        uncertaintyK: p.result.budget.statedUncertaintyK,
        coverageFactor: p.result.budget.coverageFactor,
        errorText: p.result.rounded.errorText,
        uncertaintyText: p.result.rounded.uncertaintyText,
        n: p.result.n,
        toleranceK: p.result.conformity.tolerance,
        acceptanceLimitK: p.result.conformity.acceptanceLimit,
        verdict: p.result.conformity.verdict,
      })),
      coverageProbability: first.budget.coverageProbability ?? COVERAGE_PROBABILITY,
      equipment,
      statements: {
        traceability: settings.traceabilityStatement,
        decisionRule: settings.decisionRuleStatement,
        items: settings.itemsStatement,
        reproduction: settings.reproductionStatement ?? null,
      },
      decisionRule: { label: DECISION_RULE_LABELS[rule], reference: first.conformity.ruleReference, guardBandText },
      remarks: run.notes ?? null,
    },
  }
}

/** Build, store (by SHA-256, like uploads) and describe the PDF of one revision. */
async function renderAndStore(data: CertificateData): Promise<{ sha256: string, size: number }> {
  const pdf = await certificatePdf(data)
  const sha256 = await storeUploadBytes(pdf)
  return { sha256, size: pdf.length }
}

/** Allocate the next sequence of a counter, in the caller's (IMMEDIATE) transaction: gap-free, never reused. */
export async function nextSequenceIn(t: Transaction, year: number): Promise<number> {
  const counter = await CertificateCounter.findByPk(year, { transaction: t })
  if (!counter) {
    await CertificateCounter.create({ year, lastSequence: 1 }, { transaction: t })
    return 1
  }
  const next = counter.lastSequence + 1
  await CertificateCounter.update({ lastSequence: next }, { where: { year, lastSequence: counter.lastSequence }, transaction: t })
  return next
}

// ---------------------------------------------------------------- issue, amend, withdraw

export interface Signer {
  user: User
  signatoryFunction: string
}

/** Issue the first certificate of an approved run; the signer's password was checked by the caller. */
export async function issueCertificateIn(t: Transaction, signer: Signer, runId: number, auditAction = 'issue'): Promise<Certificate> {
  const run = await CalibrationRun.findByPk(runId, { transaction: t })
  if (!run) invalidInput({ runId: 'No run with this id' })
  if (run.status !== 'approved') invalidInput({ runId: 'Only an approved run can be certified: the run must be reviewed and approved first' })
  const existing = await Certificate.findOne({ where: { runId }, transaction: t })
  if (existing) {
    throw createError({ statusCode: 409, statusMessage: 'Conflict', message: `The run already has certificate ${existing.baseNumber}; amend it instead`, data: { fields: { runId: 'Already certified' } } })
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
  const pdf = await renderAndStore(data)
  const cert = await Certificate.create({
    number, baseNumber: number, revision: 0, counterYear: year, sequence, status: 'valid',
    runId: run.id, instrumentId: g.instrument.id, organizationId: g.organization.id, instrumentSerial: g.instrument.serial,
    calibrationDate: run.calibrationDate, issueDate, issuedAt,
    signedBy: signer.user.id, signatoryName: signer.user.name, signatoryFunction: fn, signatureMeaning: SIGNATURE_MEANING,
    verificationCode: code, pdfSha256: pdf.sha256, pdfSize: pdf.size, content: data,
    amendsId: null, amendmentReason: null, supersededById: null, supersededAt: null, withdrawnAt: null, withdrawnBy: null, withdrawalReason: null,
  }, { transaction: t })
  await recordAudit(t, { userId: signer.user.id, action: auditAction, entity: 'Certificate', entityId: cert.id, after: snapshot(cert, ['content']) })
  await setNextDue(t, signer.user.id, g.instrument, run.calibrationDate, cert.number)
  await notifyCertificateIssued(t, cert)
  return cert
}

/** The instrument's next due date = calibration date + its interval (month-end safe). */
async function setNextDue(t: Transaction, userId: number, instrument: Instrument, calibrationDate: string, number: string): Promise<void> {
  const due = addMonths(calibrationDate, instrument.calibrationIntervalMonths)
  if (instrument.nextDueDate === due) return
  const before = snapshot(instrument)
  instrument.set({ nextDueDate: due })
  await instrument.save({ transaction: t })
  await recordAudit(t, { userId, action: 'certificate-due-date', entity: 'Instrument', entityId: instrument.id, before, after: { ...snapshot(instrument), certificate: number } })
}

async function findCertificate(t: Transaction, id: number): Promise<Certificate> {
  const cert = await Certificate.findByPk(id, { transaction: t })
  if (!cert) notFound('certificate')
  return cert
}

function assertValid(cert: Certificate, doing: string): void {
  if (cert.status !== 'valid') {
    const message = `Certificate ${cert.number} is ${cert.status}: only the valid revision can be ${doing}`
    throw createError({ statusCode: 409, statusMessage: 'Conflict', message, data: { fields: { status: message } } })
  }
}

/**
 * A new revision of the same number (`-R1`, `-R2` …) built from the records as they are now, with
 * the reason on it; the earlier revision becomes `superseded` (its PDF is kept as it was).
 */
export async function amendCertificateIn(t: Transaction, signer: Signer, id: number, reason: string): Promise<Certificate> {
  const old = await findCertificate(t, id)
  assertValid(old, 'amended')
  const settings = await labSettingsRow(t)
  const fn = assertSignatoryFunction(settings, signer.signatoryFunction)
  const run = await CalibrationRun.findByPk(old.runId, { transaction: t })
  if (!run) notFound('run')
  const issuedAt = new Date()
  const issueDate = await labToday(issuedAt, t)
  const g = await gather(t, settings, run, issueDate)
  const revision = ((await Certificate.max<number, Certificate>('revision', { where: { baseNumber: old.baseNumber }, transaction: t })) ?? 0) + 1
  const number = revisionNumber(old.baseNumber, revision)
  const code = newVerificationCode()
  const data: CertificateData = {
    ...g.data,
    number,
    revision,
    amends: { number: old.number, issueDate: old.issueDate, reason },
    signatory: { name: signer.user.name, function: fn, meaning: SIGNATURE_MEANING, signedAt: issuedAt.toISOString() },
    verification: { code, url: verificationUrl(number, code) },
  }
  const pdf = await renderAndStore(data)
  const cert = await Certificate.create({
    number, baseNumber: old.baseNumber, revision, counterYear: old.counterYear, sequence: old.sequence, status: 'valid',
    runId: run.id, instrumentId: g.instrument.id, organizationId: g.organization.id, instrumentSerial: g.instrument.serial,
    calibrationDate: run.calibrationDate, issueDate, issuedAt,
    signedBy: signer.user.id, signatoryName: signer.user.name, signatoryFunction: fn, signatureMeaning: SIGNATURE_MEANING,
    verificationCode: code, pdfSha256: pdf.sha256, pdfSize: pdf.size, content: data,
    amendsId: old.id, amendmentReason: reason, supersededById: null, supersededAt: null, withdrawnAt: null, withdrawnBy: null, withdrawalReason: null,
  }, { transaction: t })
  const before = snapshot(old, ['content'])
  old.set({ status: 'superseded', supersededById: cert.id, supersededAt: issuedAt })
  await old.save({ transaction: t })
  await recordAudit(t, { userId: signer.user.id, action: 'supersede', entity: 'Certificate', entityId: old.id, before, after: snapshot(old, ['content']) })
  await recordAudit(t, { userId: signer.user.id, action: 'amend', entity: 'Certificate', entityId: cert.id, after: { ...snapshot(cert, ['content']), reason } })
  return cert
}

/** Withdraw the valid revision: it stays on record (and downloadable) with status `withdrawn`. */
export async function withdrawCertificateIn(t: Transaction, user: User, id: number, reason: string): Promise<Certificate> {
  const cert = await findCertificate(t, id)
  assertValid(cert, 'withdrawn')
  const before = snapshot(cert, ['content'])
  cert.set({ status: 'withdrawn', withdrawnAt: new Date(), withdrawnBy: user.id, withdrawalReason: reason })
  await cert.save({ transaction: t })
  await recordAudit(t, { userId: user.id, action: 'withdraw', entity: 'Certificate', entityId: cert.id, before, after: { ...snapshot(cert, ['content']), reason } })
  return cert
}

// ---------------------------------------------------------------- reading

async function certificateDTOs(rows: Certificate[]): Promise<CertificateDTO[]> {
  const instIds = [...new Set(rows.map(r => r.instrumentId))]
  const orgIds = [...new Set(rows.map(r => r.organizationId))]
  const userIds = [...new Set(rows.map(r => r.withdrawnBy).filter((v): v is number => !!v))]
  const [insts, orgs, users] = await Promise.all([
    instIds.length ? Instrument.findAll({ where: { id: instIds }, attributes: ['id', 'maker', 'model', 'serial'] }) : [],
    orgIds.length ? Organization.findAll({ where: { id: orgIds }, attributes: ['id', 'name'] }) : [],
    userIds.length ? User.findAll({ where: { id: userIds }, attributes: ['id', 'name'] }) : [],
  ])
  const inst = new Map(insts.map(i => [i.id, i]))
  const org = new Map(orgs.map(o => [o.id, o.name]))
  const user = new Map(users.map(u => [u.id, u.name]))
  return rows.map((c) => {
    const i = inst.get(c.instrumentId)
    return {
      id: c.id,
      number: c.number,
      baseNumber: c.baseNumber,
      revision: c.revision,
      status: c.status,
      runId: c.runId,
      instrumentId: c.instrumentId,
      instrumentSerial: i?.serial ?? c.instrumentSerial,
      instrumentLabel: i ? `${i.maker} ${i.model}` : null,
      organizationId: c.organizationId,
      organizationName: org.get(c.organizationId) ?? null,
      calibrationDate: c.calibrationDate,
      issueDate: c.issueDate,
      issuedAt: c.issuedAt.toISOString(),
      signedById: c.signedBy,
      signatoryName: c.signatoryName,
      signatoryFunction: c.signatoryFunction,
      signatureMeaning: c.signatureMeaning,
      pdfSha256: c.pdfSha256,
      pdfSize: c.pdfSize,
      amendsId: c.amendsId ?? null,
      amendmentReason: c.amendmentReason ?? null,
      supersededById: c.supersededById ?? null,
      supersededAt: c.supersededAt ? c.supersededAt.toISOString() : null,
      withdrawnAt: c.withdrawnAt ? c.withdrawnAt.toISOString() : null,
      withdrawnByName: c.withdrawnBy ? user.get(c.withdrawnBy) ?? null : null,
      withdrawalReason: c.withdrawalReason ?? null,
      version: c.version,
    }
  })
}

/** GET /api/certificates: newest first; a customer sees only its organization's (every status, marked). */
export async function listCertificates(user: SessionUser, q: CertificateQuery): Promise<Page<CertificateDTO>> {
  const filter = new ListFilter().add(organizationScope(user))
  if (q.status) filter.add({ status: q.status })
  if (q.runId) filter.add({ runId: q.runId })
  if (q.instrumentId) filter.add({ instrumentId: q.instrumentId })
  if (q.q) filter.text('Certificate', ['number', 'instrumentSerial'], q.q)
  const { rows, count } = await Certificate.findAndCountAll({
    ...filter.options(),
    attributes: { exclude: ['content'] },
    order: [['issuedAt', 'DESC'], ['id', 'DESC']],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  })
  return { rows: await certificateDTOs(rows), total: count, page: q.page, pageSize: q.pageSize }
}

/** A certificate in the user's scope, or 404 (another organization's looks like a missing one). */
export async function scopedCertificate(user: SessionUser, id: number): Promise<Certificate> {
  const cert = await Certificate.findOne({ where: { [Op.and]: [{ id }, organizationScope(user)] }, attributes: { exclude: ['content'] } })
  if (!cert) notFound('certificate')
  return cert
}

export async function certificateDetail(user: SessionUser, id: number): Promise<CertificateDetailDTO> {
  const cert = await scopedCertificate(user, id)
  const revisions = await Certificate.findAll({ where: { baseNumber: cert.baseNumber }, attributes: { exclude: ['content'] }, order: [['revision', 'ASC']] })
  const dtos = await certificateDTOs(revisions)
  const self = dtos.find(d => d.id === cert.id)!
  return { ...self, revisions: dtos, verificationCode: cert.verificationCode, verificationUrl: verificationUrl(cert.number, cert.verificationCode) }
}

/** The stored PDF of a certificate (exactly the bytes issued), or 404. */
/** The stored PDF of a certificate revision in the user's scope, as issued. */
export async function certificatePdfFile(user: SessionUser, id: number): Promise<StoredFile> {
  const cert = await scopedCertificate(user, id)
  return { sha256: cert.pdfSha256, type: 'application/pdf', size: cert.pdfSize, name: `${cert.number}.pdf` }
}


// ---------------------------------------------------------------- the routes' operations (password, then one transaction)

/** Sign and issue the first certificate of an approved run (the signatory's password again). */
export async function issueCertificate(event: H3Event, user: SessionUser, input: CertificateIssueInput): Promise<CertificateDetailDTO> {
  const signer = await verifySigningPassword(event, user, input.password)
  const cert = await inTransaction(t => issueCertificateIn(t, { user: signer, signatoryFunction: input.signatoryFunction }, input.runId))
  return certificateDetail(user, cert.id)
}

/** Issue the next revision (`-R1` …) with its reason; the earlier one becomes superseded. */
export async function amendCertificate(event: H3Event, user: SessionUser, id: number, input: CertificateAmendInput): Promise<CertificateDetailDTO> {
  const signer = await verifySigningPassword(event, user, input.password)
  const cert = await inTransaction(t => amendCertificateIn(t, { user: signer, signatoryFunction: input.signatoryFunction }, id, input.reason))
  return certificateDetail(user, cert.id)
}

/** Withdraw the valid revision, with the reason; it stays on record as withdrawn. */
export async function withdrawCertificate(event: H3Event, user: SessionUser, id: number, input: CertificateWithdrawInput): Promise<CertificateDetailDTO> {
  const signer = await verifySigningPassword(event, user, input.password)
  await inTransaction(t => withdrawCertificateIn(t, signer, id, input.reason))
  return certificateDetail(user, id)
}
