import { problemText } from './forms/api'

/**
 * A button's request (archive, approve, upload …): busy while it runs, and the API's refusal in
 * words when it fails (each field's message with its label).
 */
export function useAction() {
  const message = ref('')
  const busy = ref(false)
  async function run<T>(fn: () => Promise<T>): Promise<T | undefined> {
    busy.value = true
    message.value = ''
    try {
      return await fn()
    }
    catch (err) {
      message.value = problemText(err)
      return undefined
    }
    finally {
      busy.value = false
    }
  }
  return { message, busy, run, clear: () => (message.value = '') }
}
