import { spawn, type ChildProcess } from 'node:child_process'
import { mkdtempSync, rmSync } from 'node:fs'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'

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

export interface AppServer {
  url: string
  dataDir: string
  databasePath: string
  process: ChildProcess
  output: () => string
  stop: () => Promise<void>
}

/** Starts the built server (.output) on a free port with its own temporary database. */
export async function startAppServer(options: { seed?: boolean, env?: Record<string, string>, databasePath?: string } = {}): Promise<AppServer> {
  const port = await freePort()
  const dataDir = mkdtempSync(join(tmpdir(), 'gloamline-e2e-'))
  const databasePath = options.databasePath ?? join(dataDir, 'test.sqlite')
  let log = ''
  const child = spawn(process.execPath, [join(OUTPUT_DIR, 'server/index.mjs')], {
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
      ...options.env
    },
    stdio: ['ignore', 'pipe', 'pipe']
  })
  child.stdout!.on('data', (c) => { log += c })
  child.stderr!.on('data', (c) => { log += c })
  const url = `http://127.0.0.1:${port}`
  const deadline = Date.now() + 20_000
  for (;;) {
    if (child.exitCode !== null) throw new Error(`server exited (${child.exitCode}):\n${log}`)
    try {
      const res = await fetch(`${url}/health`)
      if (res.ok) break
    } catch { /* not listening yet */ }
    if (Date.now() > deadline) throw new Error(`server did not start:\n${log}`)
    await new Promise(r => setTimeout(r, 100))
  }
  return {
    url,
    dataDir,
    databasePath,
    process: child,
    output: () => log,
    stop: async () => {
      if (child.exitCode === null && child.signalCode === null) {
        child.kill('SIGTERM')
        await new Promise(r => child.once('exit', r))
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
