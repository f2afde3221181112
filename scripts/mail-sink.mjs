// A local SMTP sink for dev, demo and tests: accepts every message on 127.0.0.1 and keeps it.
// Run standalone (`node scripts/mail-sink.mjs`) or import startMailSink() from a test.
import { EventEmitter } from 'node:events'
import { mkdirSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { pathToFileURL } from 'node:url'
import { SMTPServer } from 'smtp-server'
import { simpleParser } from 'mailparser'

/**
 * Starts the sink; resolves to { port, url, messages, abandoned, events, waitFor, close }. Messages are
 * parsed with mailparser. With `delayMs` (tests) it holds each message before answering "accepted":
 * a sender that dies meanwhile never hears the acceptance, so the message counts as abandoned (kept
 * in `abandoned`, not in `messages`), as an SMTP client sees it. `events` emits 'holding', 'accepted'
 * and 'abandoned' with the message; `waitFor(name, count)` resolves when that many have happened.
 */
export async function startMailSink({ port = 0, host = '127.0.0.1', dir, delayMs = 0 } = {}) {
  const messages = []
  const abandoned = []
  const counts = { holding: 0, accepted: 0, abandoned: 0 }
  const events = new EventEmitter()
  const closed = new Set()
  const emit = (name, message) => {
    counts[name]++
    events.emit(name, message)
  }
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onClose(session) {
      closed.add(session.id)
    },
    onData(stream, session, callback) {
      const chunks = []
      stream.on('data', c => chunks.push(c))
      stream.on('end', async () => {
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
        // a slow mail server (tests): hold each message, the connection open, before accepting it
        if (delayMs) {
          emit('holding', message)
          await new Promise(resolve => setTimeout(resolve, delayMs))
          if (closed.has(session.id)) {
            abandoned.push(message)
            emit('abandoned', message)
            callback(new Error('the client went away before the message was accepted'))
            return
          }
        }
        messages.push(message)
        if (dir) {
          mkdirSync(dir, { recursive: true })
          writeFileSync(join(dir, `${Date.now()}-${messages.length}.eml`), raw)
        }
        callback()
        emit('accepted', message)
      })
    }
  })
  await new Promise((resolve, reject) => {
    server.once('error', reject)
    server.listen(port, host, resolve)
  })
  const actual = server.server.address().port
  return {
    port: actual,
    url: `smtp://${host}:${actual}`,
    messages,
    abandoned,
    events,
    /** Resolves once `count` events of this kind have happened in all (rejects after `ms`). */
    waitFor: (name, count = 1, ms = 30_000) => new Promise((resolve, reject) => {
      if (counts[name] >= count) return resolve(counts[name])
      const timer = setTimeout(() => {
        events.off(name, check)
        reject(new Error(`mail sink: waited ${ms} ms for ${count} '${name}', saw ${counts[name]}`))
      }, ms)
      function check() {
        if (counts[name] < count) return
        clearTimeout(timer)
        events.off(name, check)
        resolve(counts[name])
      }
      events.on(name, check)
    }),
    close: () => new Promise(resolve => server.close(resolve))
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const { describeStartError, startOnPreferredPort } = await import('./ports.mjs')
  try {
    const { service: sink, note } = await startOnPreferredPort('the mail sink', Number(process.env.MAIL_SINK_PORT || 2525),
      port => startMailSink({ port, dir: process.env.MAIL_SINK_DIR || '.data/mail-sink' }))
    if (note) console.info(`[gloamline] ${note}`)
    console.info(`[gloamline] mail sink listening on ${sink.url}`)
  } catch (err) {
    console.error(`[gloamline] the mail sink could not start: ${describeStartError(err)}.`)
    process.exit(1)
  }
}
