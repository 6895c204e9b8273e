// The arithmetic of a paged list: which rows a page is, and the meta every list answers.
// A page past the end is the last page (an emptied search keeps a table on its last rows).
import type { ListMeta } from '../schemas/list'

export interface PageWindow {
  meta: ListMeta
  offset: number
  limit: number
}

/** The window for `page` of `pageSize` rows out of `total`; an empty list is one empty page. */
export function pageWindow(page: number, pageSize: number, total: number): PageWindow {
  const pages = Math.max(1, Math.ceil(total / pageSize))
  const at = Math.min(Math.max(1, page), pages)
  return {
    meta: { total, page: at, pageSize, pages },
    offset: (at - 1) * pageSize,
    limit: pageSize,
  }
}

/** A LIKE pattern that finds `text` anywhere, its `%`, `_` and `\` matching only themselves. */
export function containsPattern(text: string): string {
  return `%${text.replace(/[%_\\]/g, c => `\\${c}`)}%`
}
