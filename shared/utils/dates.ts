// The one way Tiltwright writes dates, on pages, in PDFs and in e-mails: a day is "Dec 2, 2026",
// a moment "Dec 2, 2026, 10:15 AM". US English, as the shop's money is in US dollars.
const DAY: Intl.DateTimeFormatOptions = { dateStyle: 'medium' }
const MOMENT: Intl.DateTimeFormatOptions = { dateStyle: 'medium', timeStyle: 'short' }

/** A calendar day with no time ("2026-12-02", a DATE column) names that day wherever it is read. */
const DATE_ONLY = /^\d{4}-\d{2}-\d{2}$/

export function formatDay(value: string | Date) {
  const calendarDay = typeof value === 'string' && DATE_ONLY.test(value)
  const options = calendarDay ? { ...DAY, timeZone: 'UTC' } : DAY
  return new Date(value).toLocaleDateString('en-US', options)
}

export function formatMoment(value: string | Date) {
  return new Date(value).toLocaleString('en-US', MOMENT)
}
