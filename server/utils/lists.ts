// Every paged list route: count, then read the rows of the page that exists (a page past the
// end answers the last page), and answer `{ data, meta: { total, page, pageSize, pages } }`.
// The rows query is built but not run: this applies the page's LIMIT and OFFSET to it.
import type { ListReply } from '../../shared/schemas/list'
import { pageWindow } from '../../shared/utils/paging'

interface Pageable<R> {
  limit: (limit: number) => { offset: (offset: number) => PromiseLike<R[]> }
}

export async function pagedList<R, T>(
  query: { page: number, pageSize: number },
  counted: PromiseLike<{ n: number }[]>,
  rows: Pageable<R>,
  shape: (row: R) => T,
): Promise<ListReply<T>> {
  const [total] = await counted
  const { meta, offset, limit } = pageWindow(query.page, query.pageSize, total?.n ?? 0)
  return { data: (await rows.limit(limit).offset(offset)).map(shape), meta }
}
