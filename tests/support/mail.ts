import { baseUrl } from './api'

interface Captured { to: string[], subject: string, text: string }

/** Every message the sink holds for `to`, newest first. */
export async function mailTo(to: string): Promise<Captured[]> {
  const messages = await (await fetch(`${baseUrl}/api/dev/mail`)).json() as Captured[]
  return messages.filter(m => m.to.includes(to))
}

/** Waits for a message to `to` in the app's local mail sink and returns it. */
export async function waitForMail(to: string, subjectIncludes = '', seconds = 10): Promise<Captured> {
  const until = Date.now() + seconds * 1000
  while (Date.now() < until) {
    const found = (await mailTo(to)).find(m => m.subject.includes(subjectIncludes))
    if (found) return found
    await new Promise(r => setTimeout(r, 100))
  }
  throw new Error(`no mail to ${to} about "${subjectIncludes}" within ${seconds} s`)
}

export function linkIn(text: string, path: string): string {
  const match = text.match(new RegExp(`https?://\\S+${path}\\S+`))
  if (!match) throw new Error(`no ${path} link in: ${text}`)
  return match[0]
}
