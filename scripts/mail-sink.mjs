// A local SMTP sink for dev, demo and tests: accepts every message on 127.0.0.1 and keeps it.
// Run standalone (`node scripts/mail-sink.mjs`) or import startMailSink() from a test.
import { mkdirSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { pathToFileURL } from 'node:url'
import { SMTPServer } from 'smtp-server'
import { simpleParser } from 'mailparser'

/** Starts the sink; resolves to { port, url, messages, close }. Messages are parsed with mailparser. */
export async function startMailSink({ port = 0, dir, delayMs = 0 } = {}) {
  const messages = []
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, session, callback) {
      const chunks = []
      stream.on('data', c => chunks.push(c))
      stream.on('end', async () => {
        // a slow mail server (tests): hold each message before accepting it
        if (delayMs) await new Promise(resolve => setTimeout(resolve, delayMs))
        const raw = Buffer.concat(chunks)
        const parsed = await simpleParser(raw)
        const message = {
          to: session.envelope.rcptTo.map(r => r.address),
          from: session.envelope.mailFrom?.address,
          subject: parsed.subject ?? '',
          text: parsed.text ?? '',
          html: typeof parsed.html === 'string' ? parsed.html : '',
          receivedAt: new Date().toISOString()
        }
        messages.push(message)
        if (dir) {
          mkdirSync(dir, { recursive: true })
          writeFileSync(join(dir, `${Date.now()}-${messages.length}.eml`), raw)
        }
        callback()
      })
    }
  })
  await new Promise((resolve, reject) => {
    server.once('error', reject)
    server.listen(port, '127.0.0.1', resolve)
  })
  const actual = server.server.address().port
  return {
    port: actual,
    url: `smtp://127.0.0.1:${actual}`,
    messages,
    close: () => new Promise(resolve => server.close(resolve))
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const sink = await startMailSink({ port: Number(process.env.MAIL_SINK_PORT || 2525), dir: process.env.MAIL_SINK_DIR || '.data/mail-sink' })
  console.info(`[gloamline] mail sink listening on ${sink.url}`)
}
