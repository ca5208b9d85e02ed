import type { Page } from '#shared/types'

/**
 * State of a server-paged register list (page, size, sort, search, filters), kept in the
 * URL so a view can be reloaded and shared, and the rows fetched for it.
 */
export function useRegisterList<T>(key: string, endpoint: string, defaults: { sort: string, dir?: 'asc' | 'desc', pageSize?: number, filters?: Record<string, string> }) {
  const route = useRoute()
  const router = useRouter()
  const q = route.query
  const str = (v: unknown) => (typeof v === 'string' ? v : undefined)

  const state = reactive({
    page: Number(str(q.page)) || 1,
    pageSize: Number(str(q.pageSize)) || defaults.pageSize || 25,
    sort: str(q.sort) ?? defaults.sort,
    dir: (str(q.dir) as 'asc' | 'desc' | undefined) ?? defaults.dir ?? 'asc',
    q: str(q.q) ?? '',
    filters: Object.fromEntries(Object.keys(defaults.filters ?? {}).map(k => [k, str(q[k]) ?? defaults.filters![k]!])) as Record<string, string>,
  })

  const query = computed(() => {
    const out: Record<string, string | number> = { page: state.page, pageSize: state.pageSize, sort: state.sort, dir: state.dir }
    if (state.q.trim()) out.q = state.q.trim()
    for (const [k, v] of Object.entries(state.filters)) if (v !== '') out[k] = v
    return out
  })

  const { data, pending, error, refresh } = useFetch<Page<T>>(endpoint, { key, query, watch: [query] })

  watch(query, (value) => {
    router.replace({ query: Object.fromEntries(Object.entries(value).map(([k, v]) => [k, String(v)])) })
  })

  /** Changing a filter or the search goes back to page 1. */
  function resetPage() {
    state.page = 1
  }

  const pages = computed(() => Math.max(1, Math.ceil((data.value?.total ?? 0) / state.pageSize)))

  // The search box: what is typed reaches the query 250 ms after the last key. A new search or
  // filter starts again from page 1.
  const search = ref(state.q)
  let timer: ReturnType<typeof setTimeout> | undefined
  watch(search, (v) => {
    clearTimeout(timer)
    timer = setTimeout(() => {
      state.q = v
      resetPage()
    }, 250)
  })
  watch(() => ({ ...state.filters }), resetPage)

  /** The list's export route with the same filters, sort and search (every row, no paging). */
  const exportHref = computed(() => `${endpoint}/export?${new URLSearchParams(Object.entries(query.value).filter(([k]) => !['page', 'pageSize'].includes(k)).map(([k, v]) => [k, String(v)]))}`)

  return { state, data, pending, error, refresh, pages, resetPage, query, search, exportHref }
}
