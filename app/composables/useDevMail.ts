import type { MailMessageDTO } from '#shared/types/dto'

/** The local mail sink's inbox: what Mantissa would have e-mailed, in development and the demo. */
export function useDevMail() {
  const { data, error, refresh } = useFetch<MailMessageDTO[]>('/api/dev/mail', { key: 'dev-mail', default: () => [] })
  return { messages: data, error, refresh }
}
