// Client state kept in localStorage, declared by the store that owns it: the store names its
// key, the refs to keep, how to write them and how to read them back (checking what it
// reads), and gets forget() for its reset(). The saved copy is read as the store is created,
// whichever page creates it first (skipHydrate keeps the server's defaults from overwriting
// it), and every change is written at once. The server renders the defaults and keeps nothing.
import { skipHydrate } from 'pinia'
import { watch, type Ref } from 'vue'

export interface Persistence {
  /** Runs `change` (putting the defaults back) without saving it, then drops the saved copy. */
  forget: (change: () => void) => void
}

export function persistInStorage(
  key: string,
  refs: Ref<unknown>[],
  write: () => unknown,
  read: (saved: unknown) => void,
): Persistence {
  for (const r of refs) skipHydrate(r)
  if (import.meta.server || typeof localStorage === 'undefined') {
    return { forget: change => change() }
  }
  try {
    const saved = localStorage.getItem(key)
    if (saved !== null) read(JSON.parse(saved))
  } catch {
    // A damaged entry starts from the defaults.
    localStorage.removeItem(key)
  }
  let quiet = false
  watch(
    refs,
    () => {
      if (!quiet) localStorage.setItem(key, JSON.stringify(write()))
    },
    { deep: true, flush: 'sync' },
  )
  return {
    forget(change) {
      quiet = true
      try {
        change()
      } finally {
        quiet = false
      }
      localStorage.removeItem(key)
    },
  }
}
