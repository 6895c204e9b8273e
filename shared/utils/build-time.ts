// Durations and "how long ago" in the words the progress board uses ("1 h 20 min", "5 min ago").

/** A duration in hours and minutes: "45 min", "1 h 20 min", "3 h"; under a minute "1 min"; from a
 *  day on in days and hours ("1 day 2 h", "6 days"), where minutes no longer matter. */
export function durationWords(ms: number): string {
  const minutes = Math.max(1, Math.floor(ms / 60_000))
  const h = Math.floor(minutes / 60)
  const m = minutes % 60
  if (h >= 48) return `${Math.floor(h / 24)} days`
  if (h >= 24) return h % 24 ? `1 day ${h % 24} h` : '1 day'
  if (!h) return `${m} min`
  return m ? `${h} h ${m} min` : `${h} h`
}

/** How long ago, relative to now: "just now", "12 min ago", "2 h 5 min ago", "3 days ago". */
export function sinceWords(iso: string, now: Date): string {
  const ms = now.getTime() - new Date(iso).getTime()
  if (ms < 60_000) return 'just now'
  const days = Math.floor(ms / 86_400_000)
  if (days >= 2) return `${days} days ago`
  return `${durationWords(ms)} ago`
}
