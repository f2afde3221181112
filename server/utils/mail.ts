// The one module that sends mail: nodemailer over SMTP to SMTP_URL, or, when it is unset (dev),
// to the local sink that `npm start` runs (scripts/mail-sink.mjs). Everything else queues mail in
// the outbox (server/utils/outbox.ts), which calls sendMailMessage and records the outcome.
import { createTransport, type Transporter } from 'nodemailer'
import { getRequestURL, type H3Event } from 'h3'

export interface MailContent {
  subject: string
  html: string
  text: string
}

export interface OutgoingMail extends MailContent {
  to: string
}

export type MailSender = (mail: OutgoingMail) => Promise<{ messageId: string }>

// the port scripts/mail-sink.mjs listens on by default
const LOCAL_SINK_URL = `smtp://127.0.0.1:${process.env.MAIL_SINK_PORT || 2525}`
const DEFAULT_FROM = 'Gloamline <notices@gloamline.test>'

// Short timeouts: a send that hangs holds the outbox lease; the outbox retries with back-off anyway.
const TRANSPORT_TIMEOUTS = { connectionTimeout: 8_000, greetingTimeout: 8_000, socketTimeout: 20_000 }

const transports = new Map<string, Transporter>()

/** The SMTP server mail goes to: SMTP_URL, or the local sink. */
export function resolveSmtpUrl(): string {
  return process.env.SMTP_URL || LOCAL_SINK_URL
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
    from: process.env.MAIL_FROM || DEFAULT_FROM,
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

/**
 * The address people reach the app at, for links in mail. PUBLIC_BASE_URL wins (set it in
 * production: a request's Host header is only as trustworthy as the proxy in front of the app);
 * otherwise the origin of the request that caused the mail; null when there is neither (the timer).
 */
export function resolvePublicBaseUrl(event?: H3Event): string | null {
  const configured = process.env.PUBLIC_BASE_URL || process.env.NUXT_PUBLIC_BASE_URL
  if (configured) return configured.replace(/\/+$/, '')
  if (!event) return null
  return getRequestURL(event).origin
}
