// A table's rows fetched a page at a time, with its page, sort and filters kept in the address
// (useUrlQuery, checked by the route's own query schema). The fetch is lazy, so the page shows
// at once and the table says it is loading; a search is sent 300 ms after the last keystroke;
// any change but the page itself goes back to page 1; and a page past the end, which the
// server answers with its last page, moves the address to that page.
import { z } from 'zod'
import type { ListReply } from '~~/shared/schemas/list'

const SEARCH_DELAY_MS = 300

type State = { page: number } & Record<string, string | number>
type Reply<T> = ListReply<T> & { meta: { pages?: number } }

export function useServerList<T, S extends State>(
  url: string,
  options: { key: string, schema: z.ZodType, defaults: S, pageSize?: number },
) {
  const state = useUrlQuery(options.schema, options.defaults)
  const pageSize = options.pageSize ?? 20

  // What the search box shows; state.q (sent to the server) follows it after a pause.
  const search = ref(String(state.q?.value ?? ''))
  let timer: ReturnType<typeof setTimeout> | undefined
  watch(search, (text) => {
    clearTimeout(timer)
    timer = setTimeout(() => {
      if (state.q) state.q.value = text as S[string]
    }, SEARCH_DELAY_MS)
  })
  onScopeDispose(() => clearTimeout(timer))

  const filters = Object.keys(options.defaults).filter(k => k !== 'page')
  watch(
    () => filters.map(k => state[k]!.value),
    () => {
      state.page.value = 1
    },
  )

  const query = computed(() => {
    const q: Record<string, string | number> = { pageSize }
    for (const k of Object.keys(options.defaults)) {
      const v = state[k]!.value
      if (v !== '') q[k] = v
    }
    return q
  })
  const fetched = useFetch<Reply<T>>(url, { key: options.key, query, lazy: true })

  watch(
    () => fetched.data.value?.meta,
    (meta) => {
      if (!meta?.page) return
      // The page the server answered, never past its count of pages (an empty list has one).
      const served = Math.min(meta.page, meta.pages ?? meta.page)
      if (served !== state.page.value) state.page.value = served
    },
    // Immediate: the first answer comes with the server-rendered page, not as a change.
    { immediate: true },
  )

  function setSort(next: { sort: string, dir: 'asc' | 'desc' }) {
    if (state.sort) state.sort.value = next.sort as S[string]
    if (state.dir) state.dir.value = next.dir as S[string]
  }

  // Only these of useFetch's answer: its `status` would shadow a filter of that name.
  const { data, pending, error, refresh } = fetched
  return {
    ...state,
    search,
    pageSize,
    setSort,
    data,
    pending,
    error,
    refresh,
    rows: computed(() => data.value?.data ?? []),
    total: computed(() => data.value?.meta?.total),
    pages: computed(() => data.value?.meta?.pages),
  }
}

/** The address query of a list with no sort or search of its own: only its page. */
export const pageOnlyQuery = z.object({ page: z.coerce.number().int().min(1) })
