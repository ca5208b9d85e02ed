/**
 * The instrument list query, shared by GET /api/instruments and the benchmark
 * (scripts/bench/registers.ts), so both run the same SQL. No Nitro auto-imports here.
 *
 * Speed on 100 000 rows:
 * - the page: one statement, a LIMIT/OFFSET subquery for ids ordered by the sort column and then id
 *   (a stable order), served by migration 0002's indexes (one per sortable text column, NOCASE, and
 *   (archived, column); 0011's (archived, column, id) on PostgreSQL), joined to those rows with their
 *   organization's and responsivity tables' names, as plain rows (no model instances):
 *   {@link queryInstrumentPage};
 * - the total: counted once per filter and kept against the change counter `instruments`
 *   (server/utils/changeCounters.ts): a later page, or the same filter from any client, reuses it
 *   until an instrument is added, archived or changed in a column a filter reads, on any instance;
 * - the search `q` finds any part of a serial or asset tag — SQLite: the FTS5 trigram table
 *   `instrument_search` (migration 0015); PostgreSQL: trigram GIN indexes on lower(serial) and
 *   lower("assetTag") — and a maker or model by its beginning (their prefix indexes). Text shorter
 *   than three characters (no trigram in it) is looked for with LIKE '%…%' over the table.
 */
import { Op, QueryTypes, literal, type Order } from 'sequelize'
import type { InstrumentQuery } from '#shared/schemas/registerQuery'
import type { InstrumentDTO } from '#shared/types'
import { Instrument } from '#server/models/Instrument'
import { CountCache } from '#server/utils/changeCounters'
import { onPostgres, sequelize } from '#server/utils/db'
import { ListFilter, escapeLike, likeCondition, quotedColumn } from '#server/utils/search'

export type InstrumentListOptions = Pick<InstrumentQuery, 'page' | 'pageSize' | 'sort' | 'dir'> & Partial<Pick<InstrumentQuery, 'q' | 'status' | 'kind' | 'organizationId' | 'dueBefore' | 'archived'>>

/** Columns the search `q` looks at: any part of serial and asset tag, the beginning of maker and model. */
export const INSTRUMENT_SEARCH_COLUMNS = ['serial', 'assetTag', 'maker', 'model'] as const
/** The columns searched anywhere in their text (trigram indexes). */
export const INSTRUMENT_CONTAINS_COLUMNS = ['serial', 'assetTag'] as const
/** The columns searched by their beginning (prefix indexes). */
export const INSTRUMENT_PREFIX_COLUMNS = ['maker', 'model'] as const

/** The fewest characters a trigram index can look up. */
const TRIGRAM = 3

/** An FTS5 string: the text in double quotes, inner quotes doubled (matched as one run of characters). */
function ftsPhrase(q: string): string {
  return `"${q.replace(/"/g, '""')}"`
}

/** `q` anywhere in serial or asset tag, or at the start of maker or model. */
function addSearch(f: ListFilter, q: string): void {
  const col = (c: string) => quotedColumn('Instrument', c)
  const prefix = f.param(`${escapeLike(q)}%`)
  const starts = INSTRUMENT_PREFIX_COLUMNS.map(c => likeCondition(col(c), prefix))
  let anywhere: string[]
  if (!onPostgres() && [...q].length >= TRIGRAM) {
    anywhere = [`${col('id')} IN (SELECT rowid FROM instrument_search WHERE instrument_search MATCH ${f.param(ftsPhrase(q))})`]
  }
  else {
    const contains = f.param(`%${escapeLike(q)}%`)
    anywhere = INSTRUMENT_CONTAINS_COLUMNS.map(c => likeCondition(col(c), contains))
  }
  f.sql(`(${[...anywhere, ...starts].join(' OR ')})`)
}

/** The filter of an instrument list (where + bound parameters). */
export function instrumentFilter(o: Omit<InstrumentListOptions, 'page' | 'pageSize' | 'sort' | 'dir'>): ListFilter {
  const f = new ListFilter()
  const archived = o.archived ?? 'false'
  if (archived !== 'all') f.add({ archived: archived === 'true' })
  if (o.organizationId !== undefined) f.add({ organizationId: o.organizationId })
  if (o.status) f.add({ status: o.status })
  if (o.kind) f.add({ kind: o.kind })
  if (o.dueBefore) f.add({ nextDueDate: { [Op.lt]: o.dueBefore } })
  if (o.q) addSearch(f, o.q)
  return f
}

/** What the total depends on besides the table: every filter field (not the page or the order). */
export function instrumentFilterKey(o: Omit<InstrumentListOptions, 'page' | 'pageSize' | 'sort' | 'dir'>): string {
  return JSON.stringify([o.archived ?? 'false', o.organizationId ?? null, o.status ?? null, o.kind ?? null, o.dueBefore ?? null, o.q ?? null])
}

/**
 * ORDER BY the sort column, then id (a stable order), as SQL for the instruments table under
 * `alias`. On PostgreSQL, a text search sorted by one of the searched columns orders by
 * `lower(column)` instead (the same order under the database's case-insensitive collation): no
 * index gives that order, so the planner finds the matches through the search's indexes and sorts
 * those few, rather than walking the sort column's index past every row that sorts before the
 * first match. `sort` is one of the schema's column names, never free text.
 */
export function instrumentOrderSql(alias: string, sort: InstrumentListOptions['sort'], dir: InstrumentListOptions['dir'], searching = false): string {
  const d = dir === 'desc' ? 'DESC' : 'ASC'
  const column = quotedColumn(alias, sort)
  const key = searching && onPostgres() && (INSTRUMENT_SEARCH_COLUMNS as readonly string[]).includes(sort) ? `lower(${column})` : column
  return `${key} ${d}, ${quotedColumn(alias, 'id')} ${d}`
}

/** {@link instrumentOrderSql} as a Sequelize order for `Instrument.findAll`. */
export function instrumentOrder(sort: InstrumentListOptions['sort'], dir: InstrumentListOptions['dir'], searching = false): Order {
  return [literal(instrumentOrderSql(Instrument.name, sort, dir, searching))]
}

/** Totals per filter, kept while no instrument changes (see the module's note). */
const totals = new CountCache('instruments')

/**
 * The number of instruments matching the filter: cached per filter against the change counter.
 * @param version - the counter `instruments` as the caller read it (else it is read here)
 */
export function countInstruments(o: Omit<InstrumentListOptions, 'page' | 'pageSize' | 'sort' | 'dir'>, version?: number): Promise<number> {
  const compute = () => Instrument.count(instrumentFilter(o).options())
  return version === undefined ? totals.get(instrumentFilterKey(o), compute) : totals.getAt(version, instrumentFilterKey(o), compute)
}

/** An instrument as the list reads it: plain values, with the names the list shows (the DTO without the past-due flag). */
export type InstrumentListRow = Omit<InstrumentDTO, 'pastDue'>

const LIST_COLUMNS = ['id', 'organizationId', 'serial', 'assetTag', 'maker', 'model', 'kind', 'bandLambda1Um', 'bandLambda2Um', 'spectralResponseId',
  'band2Lambda1Um', 'band2Lambda2Um', 'band2SpectralResponseId', 'emissivityRatioSetting', 'distanceToSpot', 'rangeMinK', 'rangeMaxK', 'defaultEmissivity', 'resolutionK', 'accuracy', 'calibrationIntervalMonths', 'status', 'nextDueDate',
  'photoUploadId', 'notes', 'archived', 'version', 'createdAt', 'updatedAt'] as const

/** A stored timestamp as ISO 8601: a Date (PostgreSQL) or SQLite's text as Sequelize writes it ('YYYY-MM-DD HH:MM:SS.SSS +00:00'). */
export function isoTimestamp(v: unknown): string {
  if (v instanceof Date) return v.toISOString()
  const s = String(v)
  // the usual case, milliseconds and UTC, is already ISO 8601 but for two characters
  const exact = /^(\d{4}-\d\d-\d\d) (\d\d:\d\d:\d\d\.\d{3}) \+00:00$/.exec(s)
  if (exact) return `${exact[1]}T${exact[2]}Z`
  const m = /^(\d{4}-\d\d-\d\d) (\d\d:\d\d:\d\d(?:\.\d+)?) \+00:00$/.exec(s)
  return m ? new Date(`${m[1]}T${m[2]}Z`).toISOString() : new Date(s).toISOString()
}

/** The values of a list row, in the order of {@link LIST_FIELDS}, as the page's SQL returns them. */
type ListTuple = unknown[]

/** What the page's SQL returns for each instrument, in order: its columns and the names the list shows. */
const LIST_FIELDS = [...LIST_COLUMNS, 'organizationName', 'spectralResponseName', 'band2SpectralResponseName'] as const

/** A row of the list's SQL as plain values, the same on both engines. */
function listRow(t: ListTuple): InstrumentListRow {
  const r: Record<string, unknown> = {}
  for (let k = 0; k < LIST_FIELDS.length; k++) r[LIST_FIELDS[k]!] = t[k]
  r.accuracy = typeof r.accuracy === 'string' ? JSON.parse(r.accuracy) : r.accuracy
  r.archived = !!r.archived
  r.createdAt = isoTimestamp(r.createdAt)
  r.updatedAt = isoTimestamp(r.updatedAt)
  return r as unknown as InstrumentListRow
}

/**
 * One page of instruments as plain rows and the total matching. The page is one statement: the
 * page's ids in a subquery (LIMIT/OFFSET over the filter and the order: an index-only scan when an
 * index covers the filter and the sort, which keeps deep pages cheap), then those rows by primary key
 * with their organization's and both bands' responsivity tables' names joined in, and the change
 * counter `instruments` read in the same statement. The total comes from the per-filter cache
 * against that reading (a COUNT, after it, only when the filter is new or an instrument changed since).
 * The SQL is written here rather than through `findAll`: a model query on SQLite costs a second
 * round trip (Sequelize reads the table's column types first) and builds more than a list needs.
 */
export async function queryInstrumentPage(o: InstrumentListOptions): Promise<{ rows: InstrumentListRow[], total: number }> {
  const { rows, version } = await pageRows(o)
  return { rows, total: await countInstruments(o, version) }
}

/** The page's rows, and the change counter `instruments` read in the same statement. */
async function pageRows(o: InstrumentListOptions): Promise<{ rows: InstrumentListRow[], version: number | undefined }> {
  const { where, bind } = instrumentFilter(o).options()
  const qi = sequelize.getQueryInterface()
  const alias = qi.quoteIdentifier(Instrument.name)
  const whereSql = (qi.queryGenerator as { whereQuery: (w: unknown, opts: object) => string }).whereQuery(where, { model: Instrument })
  const searching = !!o.q
  // The page comes back as one JSON array of value arrays (one string for the driver to pass on, not
  // an object per row with a property per column), with the change counter beside it.
  const [arrayOf, tuple] = onPostgres() ? ['json_agg', 'json_build_array'] : ['json_group_array', 'json_array']
  const names = ['o.name', 's.name', 's2.name']
  const [result] = await sequelize.query<{ listVersion: number | string | null, page: string | ListTuple[] | null }>(
    `SELECT (SELECT value FROM change_counters WHERE name = 'instruments') AS "listVersion",
            ${arrayOf}(${tuple}(${[...LIST_COLUMNS.map(c => `i."${c}"`), ...names].join(', ')}) ORDER BY ${instrumentOrderSql('i', o.sort, o.dir, searching)}) AS page
       FROM (SELECT ${alias}."id" FROM instruments AS ${alias} ${whereSql}
              ORDER BY ${instrumentOrderSql(Instrument.name, o.sort, o.dir, searching)} LIMIT $pageLimit OFFSET $pageOffset) AS p
       JOIN instruments i ON i.id = p.id
       LEFT JOIN organizations o ON o.id = i."organizationId"
       LEFT JOIN spectral_responses s ON s.id = i."spectralResponseId"
       LEFT JOIN spectral_responses s2 ON s2.id = i."band2SpectralResponseId"`,
    { type: QueryTypes.SELECT, bind: { ...bind, pageLimit: o.pageSize, pageOffset: (o.page - 1) * o.pageSize } },
  )
  // SQLite returns the array as text, PostgreSQL's driver parses json itself (and json_agg of no rows is null)
  const tuples = typeof result?.page === 'string' ? JSON.parse(result.page) as ListTuple[] : (result?.page ?? [])
  const version = result?.listVersion === null || result?.listVersion === undefined ? undefined : Number(result.listVersion)
  return { rows: tuples.map(listRow), version }
}
