import { SMTPServer } from 'smtp-server'
import { simpleParser } from 'mailparser'
import { randomUUID } from 'node:crypto'
import type { MailMessageDTO } from '#shared/types/dto'

const KEEP = 500
const captured: MailMessageDTO[] = []

/** Messages the local sink received, newest first (development and tests only). */
export function capturedMail(): readonly MailMessageDTO[] {
  return captured
}

/** Starts an SMTP server on 127.0.0.1 that keeps what it receives in memory. */
export function startMailSink(port: number): Promise<SMTPServer> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const to = [parsed.to].flat().flatMap(address => address?.value.map(v => v.address ?? '') ?? [])
          captured.unshift({
            id: randomUUID(),
            to,
            from: parsed.from?.text ?? '',
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            receivedAt: new Date().toISOString(),
          })
          captured.length = Math.min(captured.length, KEEP)
          callback()
        })
        .catch(callback)
    },
  })
  return new Promise((resolve, reject) => {
    server.once('error', reject)
    server.listen(port, '127.0.0.1', () => resolve(server))
  })
}
