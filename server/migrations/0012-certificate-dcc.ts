import { DataTypes, type QueryInterface } from 'sequelize'
import { dialectOf } from './lib'

/**
 * The digital calibration certificate (DCC XML) of each certificate revision, stored by its
 * SHA-256 beside the PDF: `dccSha256` and `dccSize`. Certificates issued before this change have
 * none until their DCC is first asked for; it is then built from what they state and stored once.
 * Like the PDF's, the DCC's hash never changes once set — a trigger `certificates_dcc_fixed` on
 * both engines refuses any change of a DCC hash or size once the hash is set, and a size without a
 * hash (or the reverse). On SQLite the trigger `certificates_fixed` (migration 0004), which freezes
 * a superseded or withdrawn revision entirely, is rewritten to allow on such a revision exactly one
 * change: filling in the DCC it lacked, leaving every status column as it was.
 */
const STATUS = ['status', 'supersededById', 'supersededAt', 'withdrawnAt', 'withdrawnBy', 'withdrawalReason']

/** The clause of 0004's trigger that freezes a revision once it is no longer valid. */
const NOT_VALID = "OLD.status <> 'valid' OR"
const same = (c: string) => `NEW."${c}" IS OLD."${c}"`
/** …except for the one change that fills in a missing DCC and leaves the status columns as they were. */
const NOT_VALID_EXCEPT_DCC_FILL = `(OLD.status <> 'valid' AND NOT (OLD."dccSha256" IS NULL AND NEW."dccSha256" IS NOT NULL AND ${STATUS.map(same).join(' AND ')})) OR`

const DCC_MESSAGE = 'the DCC of an issued certificate cannot change once stored'

/** The DCC columns' rule, as an SQL condition that is true for a refused change. */
const dccRefused = `(OLD."dccSha256" IS NOT NULL AND (NEW."dccSha256" IS DISTINCT FROM OLD."dccSha256" OR NEW."dccSize" IS DISTINCT FROM OLD."dccSize"))
      OR ((NEW."dccSha256" IS NULL) <> (NEW."dccSize" IS NULL))`

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.addColumn('certificates', 'dccSha256', { type: DataTypes.STRING(64), allowNull: true })
  await qi.addColumn('certificates', 'dccSize', { type: DataTypes.INTEGER, allowNull: true })
  const q = (sql: string) => qi.sequelize.query(sql)
  if (dialectOf(qi) === 'sqlite') {
    // 0004's trigger, with its freeze of non-valid revisions relaxed for the DCC fill only; read
    // back from the schema so that every column it lists (now or added since) stays listed.
    const sql = await fixedTriggerSql(qi)
    if (!sql.includes(NOT_VALID)) throw new Error('0012 expects the trigger certificates_fixed of migration 0004')
    await q('DROP TRIGGER certificates_fixed')
    await q(sql.replace(NOT_VALID, NOT_VALID_EXCEPT_DCC_FILL))
    await q(`CREATE TRIGGER certificates_dcc_fixed BEFORE UPDATE ON certificates
    WHEN ${dccRefused.replace(/IS DISTINCT FROM/g, 'IS NOT')}
    BEGIN SELECT RAISE(ABORT, '${DCC_MESSAGE}'); END`)
    return
  }
  await q(`CREATE OR REPLACE FUNCTION certificates_dcc_fixed() RETURNS trigger AS $$
    BEGIN
      IF ${dccRefused} THEN
        RAISE EXCEPTION '${DCC_MESSAGE}';
      END IF;
      RETURN NEW;
    END $$ LANGUAGE plpgsql`)
  await q(`CREATE TRIGGER certificates_dcc_fixed BEFORE UPDATE ON certificates FOR EACH ROW EXECUTE FUNCTION certificates_dcc_fixed()`)
}

async function fixedTriggerSql(qi: QueryInterface): Promise<string> {
  const [rows] = await qi.sequelize.query("SELECT sql FROM sqlite_master WHERE type = 'trigger' AND name = 'certificates_fixed'") as [{ sql: string }[], unknown]
  if (!rows[0]) throw new Error('no trigger certificates_fixed')
  return rows[0].sql
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  const q = (sql: string) => qi.sequelize.query(sql)
  if (dialectOf(qi) === 'sqlite') {
    await q('DROP TRIGGER IF EXISTS certificates_dcc_fixed')
    const sql = await fixedTriggerSql(qi)
    await q('DROP TRIGGER certificates_fixed')
    await q(sql.replace(NOT_VALID_EXCEPT_DCC_FILL, NOT_VALID))
  }
  else {
    await q('DROP TRIGGER IF EXISTS certificates_dcc_fixed ON certificates')
    await q('DROP FUNCTION IF EXISTS certificates_dcc_fixed()')
  }
  // ALTER TABLE … DROP COLUMN (SQLite 3.35+), which keeps the table's other triggers.
  await q('ALTER TABLE certificates DROP COLUMN "dccSize"')
  await q('ALTER TABLE certificates DROP COLUMN "dccSha256"')
}
