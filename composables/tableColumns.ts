// Column looks shared by every BaseDataTable (TanStack's ColumnMeta, typed below).
import type { RowData } from '@tanstack/vue-table'
import { h } from 'vue'
import { NuxtLink } from '#components'

declare module '@tanstack/vue-table' {
  // TanStack's own signature: both type parameters must be declared even when unused.
  // eslint-disable-next-line @typescript-eslint/no-unused-vars
  interface ColumnMeta<TData extends RowData, TValue> {
    /** Classes for the column's header and cells. */
    class?: string
  }
}

export const tableColumn = {
  /** Hidden on a phone: the first cell says it instead. */
  secondary: { class: 'hidden sm:table-cell' },
  /** Money and counts: right-aligned, tabular figures, never broken over lines. */
  money: { class: 'whitespace-nowrap text-right tabular-nums' },
  /** Money or counts that are also secondary. */
  secondaryMoney: { class: 'hidden whitespace-nowrap text-right tabular-nums sm:table-cell' },
}

/** A row's first cell: its name (a link when `to` is given) and, on a phone only, what the
 *  columns hidden there say. A number (an order's, a batch's) is kept on one line; a title
 *  written by a person (`wrap`) may break. */
export function firstCell(name: string, folded: string, to?: string, wrap = false) {
  const look = wrap ? 'font-bold break-words' : 'font-bold whitespace-nowrap'
  return h('div', [
    to ? h(NuxtLink, { to, class: look }, () => name) : h('strong', { class: look }, name),
    h('span', { class: 'block text-sm text-ink-faint sm:hidden' }, folded),
  ])
}
