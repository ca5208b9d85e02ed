/**
 * The digital calibration certificate (DCC XML) of each certificate revision: built by the pure
 * writer (server/services/dcc/build.ts) when the revision is issued, from the data it states and
 * its signed PDF, stored by SHA-256 like the PDF, its hash and size on the certificate (fixed by
 * triggers once set, migration 0012) and served exactly as stored.
 *
 * Revisions issued before DCCs existed have none: the first request builds it from what the
 * revision stores — its `content`, its number and dates, its stored PDF (checked against its
 * hash), the replaced revision's number and PDF hash, and the engine version of its certified
 * (frozen) points — stores it, records the hash on the certificate once and audits that. The
 * writer is deterministic, so the DCC is the one that would have been stored at issue.
 */
import type { Transaction } from 'sequelize'
import type { SessionUser } from '#shared/types'
import { Certificate } from '#server/models/Certificate'
import { RunPoint } from '#server/models/RunPoint'
import { recordAudit } from '#server/utils/audit'
import { conflict } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'
import { buildDcc, type DccInput } from '#server/services/dcc/build'
import { DCC_MIME_TYPE } from '#server/services/dcc/format'
import { readStoredBytes, storeUploadBytes, type StoredFile } from '#server/services/uploads/uploads'
import { certificateFileName, scopedCertificate } from './certificates'
import type { CertificateData } from './pdf'

/** Build the DCC and store it by its SHA-256 (once, like uploads and the PDF). */
export async function renderAndStoreDcc(input: DccInput, t?: Transaction): Promise<{ sha256: string, size: number }> {
  const xml = buildDcc(input)
  return { sha256: await storeUploadBytes(xml, t), size: xml.length }
}

/** The parts of `content` the DCC states; a revision stored with less cannot have a DCC built later. */
const REQUIRED: readonly (keyof CertificateData)[] = ['lab', 'customer', 'instrument', 'receipt', 'place', 'referenceBasis', 'method', 'dates', 'environment', 'points', 'coverageProbability', 'equipment', 'statements', 'signatory', 'verification']

/** What the DCC of a stored revision is built from (see the module comment). */
export async function dccInputOf(cert: Certificate, t?: Transaction): Promise<DccInput> {
  const content = (cert.content ?? {}) as CertificateData
  const missing = REQUIRED.filter(k => content[k] === undefined || content[k] === null)
  if (missing.length || !content.points.length) conflict(`Certificate ${cert.number} was stored without ${missing.join(', ') || 'points'}: no DCC can be built from it`, 'dcc')
  const previous = cert.amendsId ? await Certificate.findByPk(cert.amendsId, { transaction: t }) : null
  const points = await RunPoint.findAll({ where: { runId: cert.runId, voidedAt: null }, attributes: ['engineVersion'], transaction: t })
  return {
    content,
    certificate: { number: cert.number, calibrationDate: cert.calibrationDate, issueDate: cert.issueDate },
    pdf: { bytes: await readStoredBytes(cert.pdfSha256), fileName: certificateFileName(cert.number, 'pdf') },
    previousReport: previous ? { number: previous.number, pdfSha256: previous.pdfSha256 } : null,
    engineVersions: points.map(p => p.engineVersion),
  }
}

/**
 * Give a revision issued before DCCs existed its DCC: build, store, record the hash once (only
 * where none is recorded yet, so two first requests at once record it once) with an audit row.
 */
async function fillMissingDcc(user: SessionUser, cert: Certificate): Promise<void> {
  const stored = await renderAndStoreDcc(await dccInputOf(cert))
  await inTransaction(async (t) => {
    const [changed] = await Certificate.update({ dccSha256: stored.sha256, dccSize: stored.size }, { where: { id: cert.id, dccSha256: null }, transaction: t })
    if (changed) {
      await recordAudit(t, { userId: user.id, action: 'store-dcc', entity: 'Certificate', entityId: cert.id, after: { number: cert.number, dccSha256: stored.sha256, dccSize: stored.size, builtFrom: 'the stored certificate content and PDF, on first request' } })
    }
  })
  await cert.reload()
}

/**
 * The stored DCC of a certificate revision in the user's scope (404 otherwise), as issued; built
 * and stored first for a revision issued before DCCs existed.
 */
export async function certificateDccFile(user: SessionUser, id: number): Promise<StoredFile> {
  const cert = await scopedCertificate(user, id)
  if (!cert.dccSha256 || !cert.dccSize) await fillMissingDcc(user, cert)
  return { sha256: cert.dccSha256!, type: DCC_MIME_TYPE, size: cert.dccSize!, name: certificateFileName(cert.number, 'dcc') }
}
