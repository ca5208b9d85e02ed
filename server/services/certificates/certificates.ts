/**
 * Certificates as they are read: lists and details from what was issued (the data stored with each
 * certificate when it was signed — never the live instrument or customer, which may have changed
 * since), every revision of a number, and the stored PDF exactly as issued. Signing, amending and
 * withdrawing are in ./issue.ts; the public verification in ./verification.ts.
 */
import { Op } from 'sequelize'
import type { CertificateQuery } from '#shared/schemas/certificate'
import type { CertificateDTO, CertificateDetailDTO, Page, SessionUser } from '#shared/types'
import { Certificate } from '#server/models/Certificate'
import { User } from '#server/models/User'
import { organizationScope } from '#server/utils/access'
import { notFound } from '#server/utils/errors'
import { publicBaseUrl } from '#server/utils/publicUrl'
import { ListFilter } from '#server/utils/search'
import type { StoredFile } from '#server/services/uploads/uploads'
import type { CertificateData } from './pdf'

/** What a certificate row states as issued (older rows may lack parts of it). */
function issued(c: Certificate): Partial<CertificateData> {
  return (c.content ?? {}) as Partial<CertificateData>
}

async function certificateDTOs(rows: Certificate[]): Promise<CertificateDTO[]> {
  const userIds = [...new Set(rows.map(r => r.withdrawnBy).filter((v): v is number => !!v))]
  const users = userIds.length ? await User.findAll({ where: { id: userIds }, attributes: ['id', 'name'] }) : []
  const user = new Map(users.map(u => [u.id, u.name]))
  return rows.map((c) => {
    const content = issued(c)
    return {
      id: c.id,
      number: c.number,
      baseNumber: c.baseNumber,
      revision: c.revision,
      status: c.status,
      runId: c.runId,
      instrumentId: c.instrumentId,
      instrumentSerial: c.instrumentSerial,
      instrumentLabel: content.instrument ? `${content.instrument.maker} ${content.instrument.model}` : null,
      organizationId: c.organizationId,
      organizationName: content.customer?.name ?? null,
      calibrationDate: c.calibrationDate,
      issueDate: c.issueDate,
      issuedAt: c.issuedAt.toISOString(),
      signedById: c.signedBy,
      signatoryName: c.signatoryName,
      signatoryFunction: c.signatoryFunction,
      signatureMeaning: c.signatureMeaning,
      pdfSha256: c.pdfSha256,
      pdfSize: c.pdfSize,
      dccSha256: c.dccSha256 ?? null,
      dccSize: c.dccSize ?? null,
      amendsId: c.amendsId ?? null,
      amendmentReason: c.amendmentReason ?? null,
      amendmentChanges: content.amends?.changes ?? [],
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
    order: [['issuedAt', 'DESC'], ['id', 'DESC']],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  })
  return { rows: await certificateDTOs(rows), total: count, page: q.page, pageSize: q.pageSize }
}

/** A certificate in the user's scope, or 404 (another organization's looks like a missing one). */
export async function scopedCertificate(user: SessionUser, id: number): Promise<Certificate> {
  const cert = await Certificate.findOne({ where: { [Op.and]: [{ id }, organizationScope(user)] } })
  if (!cert) notFound('certificate')
  return cert
}

export async function certificateDetail(user: SessionUser, id: number): Promise<CertificateDetailDTO> {
  const cert = await scopedCertificate(user, id)
  const revisions = await Certificate.findAll({ where: { baseNumber: cert.baseNumber }, order: [['revision', 'ASC']] })
  const dtos = await certificateDTOs(revisions)
  const self = dtos.find(d => d.id === cert.id)!
  const url = `${publicBaseUrl()}/verify?number=${encodeURIComponent(cert.number)}&code=${encodeURIComponent(cert.verificationCode)}`
  return { ...self, revisions: dtos, verificationCode: cert.verificationCode, verificationUrl: url }
}

/** The name a certificate revision's file is saved under: `BL-2026-00042-R1.pdf`, `BL-2026-00042-R1.xml` (its DCC). */
export function certificateFileName(number: string, kind: 'pdf' | 'dcc'): string {
  return `${number}.${kind === 'pdf' ? 'pdf' : 'xml'}`
}

/** The stored PDF of a certificate revision in the user's scope, as issued. */
export async function certificatePdfFile(user: SessionUser, id: number): Promise<StoredFile> {
  const cert = await scopedCertificate(user, id)
  return { sha256: cert.pdfSha256, type: 'application/pdf', size: cert.pdfSize, name: certificateFileName(cert.number, 'pdf') }
}
