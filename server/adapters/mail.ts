// The one module that sends mail: nodemailer over SMTP to SMTP_URL, or, when it is unset (dev),
// to the local sink that `npm start` runs (scripts/mail-sink.mjs). Everything else queues mail in
// the outbox (server/utils/outbox.ts), which calls sendMailMessage and records the outcome.
import { createTransport, type Transporter } from 'nodemailer'
import { useServerConfig } from '../utils/config'

export interface MailContent {
  subject: string
  html: string
  text: string
}

export interface OutgoingMail extends MailContent {
  to: string
}

export type MailSender = (mail: OutgoingMail) => Promise<{ messageId: string }>

// Short timeouts: a send that hangs holds the outbox lease; the outbox retries with back-off anyway.
const TRANSPORT_TIMEOUTS = { connectionTimeout: 8_000, greetingTimeout: 8_000, socketTimeout: 20_000 }

const transports = new Map<string, Transporter>()

/** The SMTP server mail goes to: SMTP_URL, or the local sink. */
export function resolveSmtpUrl(): string {
  return useServerConfig().smtpUrl
}

function transportFor(url: string): Transporter {
  let transport = transports.get(url)
  if (!transport) {
    transport = createTransport({ url, ...TRANSPORT_TIMEOUTS })
    transports.set(url, transport)
  }
  return transport
}

/** Sends one message with its HTML and plain-text parts; rejects when the SMTP server does not accept it. */
export async function sendMailMessage(mail: OutgoingMail): Promise<{ messageId: string }> {
  const info = await transportFor(resolveSmtpUrl()).sendMail({
    from: useServerConfig().mailFrom,
    to: mail.to,
    subject: mail.subject,
    text: mail.text,
    html: mail.html
  })
  return { messageId: String(info.messageId ?? '') }
}

/** Closes pooled connections (server shutdown and tests). */
export function closeMailTransports() {
  for (const transport of transports.values()) transport.close()
  transports.clear()
}
