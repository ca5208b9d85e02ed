import { createError } from 'h3'
import { type Transaction, ForeignKeyConstraintError, OptimisticLockError, UniqueConstraintError, ValidationError } from 'sequelize'
import { writeTransaction } from './db'
import { staleRecord } from './errors'

/** Composite unique keys people meet, with the field to mark and the sentence to show. */
const UNIQUE_CLASHES: { columns: string[], field: string, message: string }[] = [
  { columns: ['maker', 'model', 'organizationId', 'serial'], field: 'serial', message: 'This customer already has an instrument with this maker, model and serial' },
]

/**
 * The field a unique clash is about, and what to say: a known composite key by its sentence, else
 * the key's last (most specific) column — an index on (organizationId, …, serial) is about the serial.
 */
export function uniqueClash(err: UniqueConstraintError): { field: string, message: string } {
  // SQLite gives the columns as a list, PostgreSQL as an object keyed by column.
  const f = err.fields as unknown
  const columns = Array.isArray(f) ? f.map(String) : f && typeof f === 'object' && Object.keys(f).length ? Object.keys(f) : err.errors.map(e => e.path).filter((p): p is string => !!p)
  const key = [...columns].sort().join(',')
  const known = UNIQUE_CLASHES.find(c => [...c.columns].sort().join(',') === key)
  if (known) return { field: known.field, message: known.message }
  return { field: columns[columns.length - 1] ?? 'body', message: 'Already in use' }
}

/**
 * Run a change in one transaction (through the process's write queue, server/utils/db.ts) and turn the database's refusals into 4xx answers:
 * a unique clash → 409 naming the field; a concurrent update → 409; a dangling
 * reference → 400 naming the field.
 */
export async function inTransaction<T>(fn: (t: Transaction) => Promise<T>): Promise<T> {
  try {
    return await writeTransaction(fn)
  }
  catch (err) {
    if (err instanceof UniqueConstraintError) {
      const { field, message } = uniqueClash(err)
      throw createError({
        statusCode: 409,
        statusMessage: 'Conflict',
        message: message === 'Already in use' ? `${field} is already in use` : message,
        data: { fields: { [field]: message } },
      })
    }
    if (err instanceof OptimisticLockError) throw staleRecord()
    if (err instanceof ForeignKeyConstraintError) {
      const field = (err.fields as string[] | undefined)?.[0] ?? 'body'
      throw createError({ statusCode: 400, statusMessage: 'Bad Request', message: 'Refers to a record that does not exist', data: { fields: { [field]: 'No such record' } } })
    }
    if (err instanceof ValidationError) {
      const fields = Object.fromEntries(err.errors.map(e => [e.path ?? 'body', e.message]))
      throw createError({ statusCode: 400, statusMessage: 'Validation Error', message: err.message, data: { fields } })
    }
    throw err
  }
}
