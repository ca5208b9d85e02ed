/**
 * Gap-free numbers for billing documents, one series per kind (quotes, orders, invoices, credit
 * notes) and year, allocated in the issuing transaction — the way certificate numbers are
 * (server/services/certificates/issue.ts `nextSequenceIn`): SQLite's transactions exclude each other
 * (BEGIN IMMEDIATE); on PostgreSQL the series' row is created if missing (INSERT … ON CONFLICT DO
 * NOTHING, which waits for a concurrent creator) and then locked (SELECT … FOR UPDATE) until the
 * transaction ends, so concurrent issues on any instance take consecutive numbers one after
 * another. A transaction that rolls back gives its number back with it: no gap.
 */
import { QueryTypes, type Transaction } from 'sequelize'
import { billingNumber, type BillingSeries } from '#shared/billing/constants'
import { BillingCounter } from '#server/models/BillingCounter'
import { onPostgres, sequelize } from '#server/utils/db'

/** The next sequence of a series in a year, in the caller's transaction. */
export async function nextBillingSequenceIn(t: Transaction, series: BillingSeries, year: number): Promise<number> {
  if (onPostgres()) {
    const [created] = await sequelize.query<{ year: number }>(
      'INSERT INTO billing_counters (series, year, "lastSequence") VALUES (:series, :year, 1) ON CONFLICT (series, year) DO NOTHING RETURNING year',
      { replacements: { series, year }, transaction: t, type: QueryTypes.SELECT },
    )
    if (created) return 1
  }
  const counter = await BillingCounter.findOne({ where: { series, year }, transaction: t, lock: t.LOCK.UPDATE })
  if (!counter) {
    await BillingCounter.create({ series, year, lastSequence: 1 }, { transaction: t })
    return 1
  }
  const next = counter.lastSequence + 1
  await BillingCounter.update({ lastSequence: next }, { where: { series, year, lastSequence: counter.lastSequence }, transaction: t })
  return next
}

/** Allocate the next number of a series for a document dated `date` (lab-local `YYYY-MM-DD`). */
export async function allocateNumberIn(t: Transaction, series: BillingSeries, date: string): Promise<{ number: string, year: number, sequence: number }> {
  const year = Number(date.slice(0, 4))
  const sequence = await nextBillingSequenceIn(t, series, year)
  return { number: billingNumber(series, year, sequence), year, sequence }
}
