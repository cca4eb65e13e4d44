// One way to write a date and a moment, for pages, e-mails and server messages alike. Always in UTC:
// the server cannot know a reader's zone, and a page drawn on the server must read the same in the browser.
const DAY = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' })
const TIME = new Intl.DateTimeFormat('en-GB', { hour: '2-digit', minute: '2-digit', hourCycle: 'h23', timeZone: 'UTC' })

type When = string | Date | null | undefined

/** "3 Dec 2026"; a dash when there is no date. */
export function formatDate(when: When): string {
  return when ? DAY.format(new Date(when)) : '—'
}

/** "3 Dec 2026, 09:32 UTC"; a dash when there is no moment. */
export function formatDateTime(when: When): string {
  if (!when) return '—'
  const date = new Date(when)
  return `${DAY.format(date)}, ${TIME.format(date)} UTC`
}
