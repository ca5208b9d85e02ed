import { createError } from 'h3'
import { type Transaction, ForeignKeyConstraintError, OptimisticLockError, UniqueConstraintError, ValidationError } from 'sequelize'
import { writeTransaction } from './db'
import { staleRecord } from './errors'

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
      const field = err.errors[0]?.path ?? 'body'
      throw createError({
        statusCode: 409,
        statusMessage: 'Conflict',
        message: `${field} is already in use`,
        data: { fields: { [field]: 'Already in use' } },
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
