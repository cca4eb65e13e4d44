import nodemailer from 'nodemailer'
import type { Transporter } from 'nodemailer'

let transporter: Transporter | undefined

function transport(): Transporter {
  if (transporter) return transporter
  const config = useRuntimeConfig()
  // Without an SMTP URL, mail goes to the local sink that server/plugins/mail-sink.ts runs.
  const url = config.smtpUrl || `smtp://127.0.0.1:${config.mailSink.port}`
  transporter = nodemailer.createTransport(url)
  return transporter
}

export interface OutgoingMail {
  to: string
  subject: string
  text: string
}

/** Sends one plain-text e-mail over SMTP; failures are logged, never fatal to the request. */
export async function sendMail(mail: OutgoingMail): Promise<boolean> {
  try {
    await transport().sendMail({ from: useRuntimeConfig().mailFrom, ...mail })
    return true
  }
  catch (error) {
    console.error(`[mail] could not send "${mail.subject}" to ${mail.to}:`, (error as Error).message)
    return false
  }
}
