/**
 * The record open in a page's side panel, kept in the URL as `?edit=new` or `?edit=<id>`, so a
 * table row can be a real link to it (Tab, Enter) and the view survives a reload.
 */
export function useEditParam() {
  const route = useRoute()
  const editing = computed<'new' | number | null>(() => {
    const v = route.query.edit
    if (v === 'new') return 'new'
    const id = Number(typeof v === 'string' ? v : '')
    return Number.isInteger(id) && id > 0 ? id : null
  })
  const open = (id: 'new' | number) => navigateTo({ query: { ...route.query, edit: String(id) } })
  const close = () => {
    const { edit: _, ...rest } = route.query
    return navigateTo({ query: rest })
  }
  return { editing, open, close }
}
