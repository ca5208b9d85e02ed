/**
 * What a record's page does besides showing it: open its edit form, archive or restore it, and
 * say what happened — each change followed by a refresh of the record.
 */
export function useRecordPage(endpoint: () => string, record: () => { version: number } | null | undefined, refresh: () => Promise<unknown>) {
  const editing = ref(false)
  const notice = ref('')
  const action = useAction()

  async function saved(text = 'Saved.') {
    editing.value = false
    await refresh()
    notice.value = text
  }
  async function setArchived(archived: boolean) {
    const r = record()
    if (!r) return
    const done = await action.run(async () => {
      await $fetch(`${endpoint()}/archive`, { method: 'POST', body: { archived, version: r.version } })
    })
    if (!done) return
    await refresh()
    notice.value = archived ? 'Archived: hidden from lists, kept with its history.' : 'Restored from the archive.'
  }
  return { editing, notice, action, saved, setArchived }
}
