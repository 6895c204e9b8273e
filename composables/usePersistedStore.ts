// Keeps a Pinia store's state in localStorage so a reload (or a dropped connection in a
// classroom) loses nothing. Client only; the server renders the defaults.
import type { Store } from 'pinia'

export function usePersistedStore(store: Store, key: string) {
  if (!import.meta.client) return
  const saved = localStorage.getItem(key)
  if (saved) {
    try {
      store.$patch(JSON.parse(saved))
    } catch {
      localStorage.removeItem(key)
    }
  }
  store.$subscribe(
    (_m, state) => {
      localStorage.setItem(key, JSON.stringify(state))
    },
    { detached: true },
  )
}
