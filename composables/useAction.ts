import { problemText } from './forms/api'
import type { FieldSpecs } from './forms/messages'

/**
 * A button's request (archive, approve, upload …): busy while it runs, and the API's refusal in
 * words when it fails (each field's message with its label, from `specs` where the API's field
 * names are not the words people read). `run` answers whether it succeeded.
 */
export function useAction(specs: FieldSpecs = {}) {
  const message = ref('')
  const busy = ref(false)
  async function run(fn: () => Promise<unknown>): Promise<boolean> {
    busy.value = true
    message.value = ''
    try {
      await fn()
      return true
    }
    catch (err) {
      message.value = problemText(err, specs)
      return false
    }
    finally {
      busy.value = false
    }
  }
  return { message, busy, run, clear: () => (message.value = '') }
}
