// What every visitor gets alike (the public catalog, a page rendered for someone signed out) is
// kept in this instance's memory for a moment instead of being read or rendered per request.
// Several instances share one database, so nothing here is the truth: a snapshot is only served
// while it is younger than SNAPSHOT_MAX_AGE_MS, counted from when its reading (or rendering)
// STARTED. So every reply reflects the database as it was at most that long before the reply,
// whichever instance changed it; and a write answered by this instance drops every snapshot at
// once (dropSnapshots(), called before the write's reply is sent), so the caller's next read on
// the same instance sees the change immediately.
import { setResponseHeader, type H3Event } from 'h3'

/** The staleness bound across instances (docs/benchmarks.md). */
export const SNAPSHOT_MAX_AGE_MS = 250

let epoch = 0

/** This instance changed something: no snapshot taken before now is served again. */
export function dropSnapshots() {
  epoch++
}

interface Taken<T> {
  value: T
  startedAt: number
  epoch: number
}

const fresh = <T>(t: Taken<T> | undefined): t is Taken<T> =>
  !!t && t.epoch === epoch && performance.now() - t.startedAt < SNAPSHOT_MAX_AGE_MS

/** Per-key snapshots of `load`: a fresh one is served, else one load per key runs at a time
 *  and every caller waiting for it shares its result (if still fresh once it arrives).
 *  `keep: false` from a loader's result means "serve it to this caller but do not keep it". */
export function snapshots<K, T>(
  load: (key: K) => Promise<T>,
  opts: { maxKeys?: number, keep?: (value: T) => boolean } = {},
) {
  const taken = new Map<K, Taken<T>>()
  const running = new Map<K, Promise<Taken<T>>>()
  const maxKeys = opts.maxKeys ?? 100

  function start(key: K): Promise<Taken<T>> {
    const startedAt = performance.now()
    const at = epoch
    const p = load(key)
      .then((value) => {
        const t = { value, startedAt, epoch: at }
        if (opts.keep?.(value) !== false) {
          if (!taken.has(key) && taken.size >= maxKeys) taken.clear()
          taken.set(key, t)
        }
        return t
      })
      .finally(() => {
        if (running.get(key) === p) running.delete(key)
      })
    running.set(key, p)
    return p
  }

  return async function get(key: K): Promise<T> {
    const have = taken.get(key)
    if (fresh(have)) return have.value
    const joined = running.get(key)
    if (joined) {
      const t = await joined.catch(() => undefined)
      if (fresh(t)) return t.value
    }
    return (await start(key)).value
  }
}

const bodies = new WeakMap<object, Map<string, string>>()

/** The JSON reply `build()` makes from a snapshot, serialized once per snapshot (and `key`)
 *  rather than once per request; it lives as long as the snapshot `of` does. What is returned is
 *  the JSON text of the T that build() returns: h3 sends a string as it is, and the content type
 *  is set here, so the caller receives exactly what returning the T would have sent. */
export function jsonOnce<T>(event: H3Event, of: object, key: string, build: () => T): T {
  let made = bodies.get(of)
  if (!made) bodies.set(of, (made = new Map()))
  let body = made.get(key)
  if (body === undefined) {
    body = JSON.stringify(build())
    made.set(key, body)
  }
  setResponseHeader(event, 'Content-Type', 'application/json')
  return body as unknown as T
}
