import { spawn, type ChildProcess } from 'node:child_process'
import { mkdtempSync, rmSync } from 'node:fs'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { performance } from 'node:perf_hooks'
import { TEST_CLOCK } from './clock'

export const DEMO_PASSWORD = 'gloamline-demo'
const ROOT = resolve(import.meta.dirname, '../..')
// the built server: .output, or the folder GLOAMLINE_OUTPUT_DIR names (see DEVELOPERS.md)
export const OUTPUT_DIR = resolve(ROOT, process.env.GLOAMLINE_OUTPUT_DIR || '.output')

/** A free TCP port on 127.0.0.1. */
export function freePort(): Promise<number> {
  return new Promise((res, rej) => {
    const srv = createServer()
    srv.once('error', rej)
    srv.listen(0, '127.0.0.1', () => {
      const port = (srv.address() as { port: number }).port
      srv.close(() => res(port))
    })
  })
}

/** The server's clock as the test sees it: where it started and where it is now. */
export interface ServerClock {
  /** The instant the server's clock started at (GLOAMLINE_CLOCK_START). */
  startMs: number
  /** The server's "now": the start instant plus the time elapsed since (monotonic, never the machine's date). */
  now: () => number
}

export interface AppServer {
  url: string
  port: number
  clock: ServerClock
  dataDir: string
  databasePath: string
  process: ChildProcess
  output: () => string
  /** Resolves once the server's output matches (an event, not a fixed sleep); rejects after `ms`. */
  waitForOutput: (pattern: RegExp, ms?: number) => Promise<string>
  /** Stops the server gently (SIGTERM) and removes its temporary folder. */
  stop: () => Promise<void>
  /** Ends the server at once (SIGKILL: no shutdown hooks run); keeps the database. */
  kill: () => Promise<void>
}

export interface StartOptions {
  seed?: boolean
  env?: Record<string, string>
  databasePath?: string
  /** The instant the server's clock starts at (ISO 8601); defaults to TEST_CLOCK.weekdayMorning. */
  clockStart?: string
  /** A port to listen on (the restart tests reuse one); a free one otherwise. */
  port?: number
  /** The script to run instead of the built server itself (scripts/cluster.mjs, which forks it). */
  script?: string
}

/**
 * Starts the built server (.output) on a free port with its own temporary database, in test mode with
 * its clock started at a fixed instant: what it calls "today" never depends on the machine's date.
 */
export async function startAppServer(options: StartOptions = {}): Promise<AppServer> {
  const port = options.port ?? await freePort()
  const clockStart = options.clockStart ?? TEST_CLOCK.weekdayMorning
  const startMs = Date.parse(clockStart)
  if (!Number.isFinite(startMs)) throw new Error(`clockStart is not an ISO instant: ${clockStart}`)
  const dataDir = mkdtempSync(join(tmpdir(), 'gloamline-e2e-'))
  const databasePath = options.databasePath ?? join(dataDir, 'test.sqlite')
  let log = ''
  const listeners = new Set<() => void>()
  const spawnedAt = performance.now()
  // the server starts its clock a moment (seconds, on a busy machine) after it is spawned and says so;
  // anchoring the test's view of that clock to the line keeps the two within milliseconds
  let clockAnchor: number | null = null
  const child = spawn(process.execPath, [options.script ?? join(OUTPUT_DIR, 'server/index.mjs')], {
    cwd: dataDir,
    env: {
      ...process.env,
      PORT: String(port),
      HOST: '127.0.0.1',
      NITRO_HOST: '127.0.0.1',
      NODE_ENV: 'production',
      DATABASE_PATH: databasePath,
      MIGRATIONS_DIR: join(ROOT, 'drizzle'),
      NUXT_SESSION_PASSWORD: 'test-session-password-that-is-long-enough-0123456789',
      SEED_DEMO: options.seed === false ? '0' : '1',
      SMTP_URL: 'smtp://127.0.0.1:9',
      FORECAST_BASE_URL: 'http://127.0.0.1:9',
      GLOAMLINE_TEST_MODE: '1',
      GLOAMLINE_CLOCK_START: clockStart,
      ...options.env
    },
    stdio: ['ignore', 'pipe', 'pipe']
  })
  const collect = (chunk: Buffer) => {
    log += chunk
    if (clockAnchor === null && log.includes('test clock starts at')) clockAnchor = performance.now()
    for (const listener of listeners) listener()
  }
  child.stdout!.on('data', collect)
  child.stderr!.on('data', collect)
  const url = `http://127.0.0.1:${port}`
  const deadline = performance.now() + 20_000
  for (;;) {
    if (child.exitCode !== null) throw new Error(`server exited (${child.exitCode}):\n${log}`)
    try {
      const res = await fetch(`${url}/health`)
      if (res.ok) break
    } catch { /* not listening yet */ }
    if (performance.now() > deadline) throw new Error(`server did not start:\n${log}`)
    await new Promise(r => setTimeout(r, 100))
  }
  const exited = () => child.exitCode !== null || child.signalCode !== null
  return {
    url,
    port,
    clock: { startMs, now: () => startMs + (performance.now() - (clockAnchor ?? spawnedAt)) },
    dataDir,
    databasePath,
    process: child,
    output: () => log,
    waitForOutput: (pattern, ms = 20_000) => new Promise((res, rej) => {
      const check = () => {
        const match = pattern.exec(log)
        if (!match) return false
        finish()
        res(match[0])
        return true
      }
      const timer = setTimeout(() => {
        finish()
        rej(new Error(`timed out waiting for ${pattern} in the server output:\n${log}`))
      }, ms)
      const finish = () => {
        clearTimeout(timer)
        listeners.delete(listener)
      }
      const listener = () => { check() }
      listeners.add(listener)
      check()
    }),
    kill: async () => {
      if (exited()) return
      const gone = new Promise(r => child.once('exit', r))
      child.kill('SIGKILL')
      await gone
    },
    stop: async () => {
      if (!exited()) {
        const gone = new Promise(r => child.once('exit', r))
        child.kill('SIGTERM')
        await gone
      }
      rmSync(dataDir, { recursive: true, force: true })
    }
  }
}

export interface ApiReply<T = any> { status: number, body: T, headers: Headers }

/** A small HTTP client that keeps the session cookie, like a browser would. */
export class ApiClient {
  cookie = ''
  constructor(readonly baseUrl: string) {}

  async request<T = any>(method: string, path: string, body?: unknown, rawBody?: string): Promise<ApiReply<T>> {
    const headers: Record<string, string> = { accept: 'application/json' }
    if (this.cookie) headers.cookie = this.cookie
    if (body !== undefined || rawBody !== undefined) headers['content-type'] = 'application/json'
    const res = await fetch(`${this.baseUrl}${path}`, { method, headers, body: rawBody ?? (body === undefined ? undefined : JSON.stringify(body)), redirect: 'manual' })
    const setCookie = res.headers.getSetCookie()
    for (const c of setCookie) {
      const pair = c.split(';')[0]!
      this.cookie = pair.endsWith('=') ? '' : pair
    }
    const text = await res.text()
    let parsed: unknown = text
    try {
      parsed = text ? JSON.parse(text) : null
    } catch { /* not JSON */ }
    return { status: res.status, body: parsed as T, headers: res.headers }
  }

  get<T = any>(path: string) { return this.request<T>('GET', path) }
  post<T = any>(path: string, body?: unknown) { return this.request<T>('POST', path, body ?? {}) }
  patch<T = any>(path: string, body?: unknown) { return this.request<T>('PATCH', path, body ?? {}) }
  delete<T = any>(path: string) { return this.request<T>('DELETE', path) }

  /** Signs in; throws unless the server accepts. */
  async signIn(email: string, password = DEMO_PASSWORD) {
    const reply = await this.post('/api/auth/login', { email, password })
    if (reply.status !== 200) throw new Error(`sign-in as ${email} failed: ${reply.status} ${JSON.stringify(reply.body)}`)
    return reply
  }
}

/** A client already signed in as the given demo account. */
export async function signedInClient(server: AppServer, email: string, password = DEMO_PASSWORD) {
  const client = new ApiClient(server.url)
  await client.signIn(email, password)
  return client
}
