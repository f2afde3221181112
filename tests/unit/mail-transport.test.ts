// The mail module over real SMTP: nodemailer to the local sink (scripts/mail-sink.mjs, an smtp-server
// on a free port), and the message as a general MIME parser reads it back (mailparser, via the sink).
import { createServer } from 'node:net'
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import { startMailSink } from '../../scripts/mail-sink.mjs'
import { closeMailTransports, resolveSmtpUrl, sendMailMessage } from '../../server/adapters/mail'
import { renderInvitationMail } from '../../emails/invitation'
import { resetServerConfig } from '../../server/utils/config'

interface SinkMessage { to: string[], from: string, subject: string, text: string, html: string }
let sink: { url: string, port: number, messages: SinkMessage[], close: () => Promise<void> }
const saved = process.env.SMTP_URL

beforeAll(async () => {
  sink = await startMailSink({ port: 0 })
})
afterEach(() => {
  closeMailTransports()
  process.env.SMTP_URL = saved
  resetServerConfig()
})
afterAll(async () => {
  await sink.close()
})

function closedPort(): Promise<number> {
  return new Promise((res) => {
    const srv = createServer()
    srv.listen(0, '127.0.0.1', () => {
      const port = (srv.address() as { port: number }).port
      srv.close(() => res(port))
    })
  })
}

describe('sending mail over SMTP', () => {
  it('delivers a message with both a plain-text and an HTML part to SMTP_URL', async () => {
    process.env.SMTP_URL = sink.url
    resetServerConfig()
    const mail = renderInvitationMail({ personName: 'Liv Aasen', inviterName: 'Ingrid Halvorsen', roleWords: 'a crew member', link: 'http://127.0.0.1:3000/welcome?token=abc', expiresText: 'Fri 15 Jan 18:00 UTC' })
    const info = await sendMailMessage({ to: 'liv.aasen@northwake.test', ...mail })
    expect(info.messageId).toMatch(/@/)
    const got = sink.messages.at(-1)!
    expect(got.to).toEqual(['liv.aasen@northwake.test'])
    expect(got.subject).toBe(mail.subject)
    // mailparser decodes the parts: the text part and the HTML part each carry the link
    expect(got.text).toContain('http://127.0.0.1:3000/welcome?token=abc')
    expect(got.html).toContain('href="http://127.0.0.1:3000/welcome?token=abc"')
  })

  it('keeps non-ASCII text intact (true minus, middle dot, ø) through MIME encoding', async () => {
    process.env.SMTP_URL = sink.url
    resetServerConfig()
    const subject = 'Tromsø · −27 min since yesterday'
    await sendMailMessage({ to: 'nora.tuktu@northwake.test', subject, text: `Daylight 3 h 5 min (${subject})`, html: `<p>${subject}</p>` })
    const got = sink.messages.at(-1)!
    expect(got.subject).toBe(subject)
    expect(got.text).toContain('−27 min')
  })

  it('rejects when nothing listens at SMTP_URL, so the outbox can record the failure', async () => {
    process.env.SMTP_URL = `smtp://127.0.0.1:${await closedPort()}`
    resetServerConfig()
    await expect(sendMailMessage({ to: 'x@northwake.test', subject: 's', text: 't', html: '<p>t</p>' })).rejects.toMatchObject({ code: expect.stringMatching(/ECONNREFUSED|ESOCKET|ECONNECTION/) })
  })

  it('falls back to the local sink port when SMTP_URL is unset', () => {
    delete process.env.SMTP_URL
    resetServerConfig()
    expect(resolveSmtpUrl()).toMatch(/^smtp:\/\/127\.0\.0\.1:\d+$/)
  })
})
