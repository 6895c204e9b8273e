// One way to show dates everywhere: "Dec 2, 2026" (or "December 2, 2026" on documents) and
// "Dec 2, 2026, 10:15 AM" for moments. US English, as the shop's money is in US dollars.
export function formatDay(value: string | Date, style: 'medium' | 'long' = 'medium') {
  return new Date(value).toLocaleDateString('en-US', { dateStyle: style })
}

export function formatMoment(value: string | Date) {
  return new Date(value).toLocaleString('en-US', { dateStyle: 'medium', timeStyle: 'short' })
}
