// The query of every server-side paged table: page, page size, a sort key from a fixed
// list (never a free string), a direction and an optional search.
import { z } from 'zod'

export function listQuerySchema<const K extends readonly [string, ...string[]]>(
  sortKeys: K,
  defaultSort: K[number],
  defaultDir: 'asc' | 'desc' = 'asc',
) {
  return z.object({
    page: z.coerce.number().int().min(1, 'Pages start at 1.').default(1),
    pageSize: z.coerce.number().int().min(1).max(100, 'At most 100 rows a page.').default(20),
    sort: z
      .enum(sortKeys, { error: `Sort by one of: ${sortKeys.join(', ')}.` })
      .default(defaultSort as never),
    dir: z.enum(['asc', 'desc'], { error: 'Direction is asc or desc.' }).default(defaultDir),
    q: z.string().trim().max(100, 'Keep the search to 100 characters or fewer.').optional(),
  })
}

export interface ListMeta {
  total: number
  page: number
  pageSize: number
  /** How many pages there are (at least 1); `page` is never past it. */
  pages: number
}
export interface ListReply<T> {
  data: T[]
  meta: ListMeta
}
