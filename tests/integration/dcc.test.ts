// The stored DCC of certificates against a temporary SQLite database seeded with the demo scenario:
// certificates issued before DCCs existed (0012 undone and applied again, so their DCC columns are
// empty) get theirs on first request — the same bytes issue stored, since the writer is
// deterministic — once, audited; after that the database refuses any change of it (migration 0012).
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { hasXmllint, validateDcc } from '../support/dccSchema'

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-dcc-it-'))
process.env.DATABASE_URL = `sqlite:${path.join(dir, 'dcc.sqlite')}`
process.env.BANDLIGHT_DATA_DIR = path.join(dir, 'files')

const { resetConfig } = await import('../../server/utils/config')
resetConfig()
const db = await import('../../server/utils/db')
const { migrator } = await import('../../server/utils/migrate')
const { AuditEvent, Certificate, User } = await import('../../server/models')
const { seedDemo } = await import('../../scripts/demo-data')
const { certificateDccFile } = await import('../../server/services/certificates/dcc')
const { readStoredBytes } = await import('../../server/services/uploads/uploads')

const lab = async () => {
  const u = (await User.findOne({ where: { email: 'quality@bandlight.test' } }))!
  return { id: u.id, name: u.name, email: u.email, role: u.role, organizationId: null }
}
/** Run SQL directly; the database's refusal message (Sequelize wraps it), or 'done'. */
const refusal = (sql: string) => db.sequelize.query(sql).then(() => 'done', (e: { original?: Error, message: string }) => e.original?.message ?? e.message)

let issued: Map<number, string>

beforeAll(async () => {
  await migrator().up()
  await seedDemo()
  issued = new Map((await Certificate.findAll({ order: [['id', 'ASC']] })).map(c => [c.id, c.dccSha256!]))
  // As if the certificates had been issued before 0012: undo it and apply it again.
  await migrator().down({ to: '0012-certificate-dcc' })
  await migrator().up()
}, 120_000)

afterAll(async () => {
  await db.closeDatabase()
  fs.rmSync(dir, { recursive: true, force: true })
})

describe('certificates issued before DCCs existed', () => {
  it('the demo has valid, superseded and withdrawn revisions, each issued with a DCC', () => {
    expect(issued.size).toBeGreaterThanOrEqual(3)
    for (const sha of issued.values()) expect(sha).toMatch(/^[0-9a-f]{64}$/)
  })

  it('get on first request the DCC issue stored, once, with an audit row; a second request changes nothing', async () => {
    const rows = await Certificate.findAll({ order: [['id', 'ASC']] })
    expect(new Set(rows.map(r => r.status))).toEqual(new Set(['valid', 'superseded', 'withdrawn']))
    expect(rows.every(r => r.dccSha256 === null && r.dccSize === null)).toBe(true)
    const user = await lab()
    for (const r of rows) {
      const file = await certificateDccFile(user, r.id)
      expect(file.sha256, r.number).toBe(issued.get(r.id))
      expect(file).toMatchObject({ type: 'application/xml', name: `${r.number}.xml` })
      const bytes = await readStoredBytes(file.sha256)
      expect(bytes.length).toBe(file.size)
      if (hasXmllint) expect(validateDcc(bytes).valid, r.number).toBe(true)
      await r.reload()
      expect([r.dccSha256, r.dccSize]).toEqual([file.sha256, file.size])
    }
    const audits = await AuditEvent.count({ where: { action: 'store-dcc', entity: 'Certificate' } })
    expect(audits).toBe(rows.length)
    for (const r of rows) await certificateDccFile(user, r.id)
    expect(await AuditEvent.count({ where: { action: 'store-dcc', entity: 'Certificate' } })).toBe(audits)
  })

  it('then the database refuses any change of the stored DCC, and a superseded revision stays frozen otherwise', async () => {
    const [valid] = await Certificate.findAll({ where: { status: 'valid' } })
    const [superseded] = await Certificate.findAll({ where: { status: 'superseded' } })
    expect(await refusal(`UPDATE certificates SET "dccSha256" = '${'0'.repeat(64)}' WHERE id = ${valid!.id}`)).toMatch(/the DCC of an issued certificate cannot change once stored/)
    expect(await refusal(`UPDATE certificates SET "dccSize" = "dccSize" + 1 WHERE id = ${valid!.id}`)).toMatch(/the DCC of an issued certificate cannot change once stored/)
    expect(await refusal(`UPDATE certificates SET "dccSha256" = NULL, "dccSize" = NULL WHERE id = ${superseded!.id}`)).toMatch(/cannot change/)
    expect(await refusal(`UPDATE certificates SET "status" = 'withdrawn' WHERE id = ${superseded!.id}`)).toMatch(/an issued certificate cannot change: amend or withdraw it/)
    expect(await refusal(`UPDATE certificates SET "pdfSha256" = '${'0'.repeat(64)}' WHERE id = ${valid!.id}`)).toMatch(/an issued certificate cannot change: amend or withdraw it/)
    // What is allowed stays allowed: the valid revision's status moves.
    expect(await refusal(`UPDATE certificates SET "status" = 'withdrawn', "withdrawnAt" = '2027-01-01 00:00:00.000 +00:00' WHERE id = ${valid!.id}`)).toBe('done')
  })

  it('a customer gets only its own organization’s DCC (404 for another’s)', async () => {
    const rows = await Certificate.findAll()
    const other = rows[0]!.organizationId + 1000
    await expect(certificateDccFile({ id: 1, name: 'c', email: 'c@x.test', role: 'customer', organizationId: other }, rows[0]!.id)).rejects.toMatchObject({ statusCode: 404 })
    const own = await certificateDccFile({ id: 1, name: 'c', email: 'c@x.test', role: 'customer', organizationId: rows[0]!.organizationId }, rows[0]!.id)
    expect(own.sha256).toBe(issued.get(rows[0]!.id))
  })
})
