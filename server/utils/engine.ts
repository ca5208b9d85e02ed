import { EngineInputError } from '../../shared/radiometry/errors'

/**
 * Run an engine computation; an input the engine refuses becomes 400 naming the
 * field (the engine spells fields as the API's JSON does, e.g. `band.lambda2Um`).
 */
export function engine<T>(fn: () => T): T {
  try {
    return fn()
  }
  catch (err) {
    throw engineError(err)
  }
}

export function engineError(err: unknown): unknown {
  if (err instanceof EngineInputError) {
    const message = err.message.startsWith(`${err.field}: `) ? err.message.slice(err.field.length + 2) : err.message
    return createError({
      statusCode: 400,
      statusMessage: 'Validation Error',
      message: `Invalid input: ${err.field}: ${message}`,
      data: { message: `Invalid input: ${err.field}: ${message}`, fields: { [err.field]: message } },
    })
  }
  return err
}
