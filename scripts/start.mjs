// The demo start: build, keep a session secret under .data/, start the local mail sink and
// forecast fake (unless real ones are configured), then serve. Migrations and the demo seed run
// inside the server at start-up; seeding only ever touches an empty database.
import { spawn, spawnSync } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { join, resolve } from 'node:path'

const root = resolve(import.meta.dirname, '..')
const dataDir = join(root, '.data')
mkdirSync(dataDir, { recursive: true })

function sessionPassword() {
  if (process.env.NUXT_SESSION_PASSWORD) return process.env.NUXT_SESSION_PASSWORD
  const file = join(dataDir, 'session-password')
  if (!existsSync(file)) writeFileSync(file, randomBytes(32).toString('hex'), { mode: 0o600 })
  return readFileSync(file, 'utf8').trim()
}

if (process.env.SKIP_BUILD !== '1') {
  const build = spawnSync('npx', ['nuxt', 'build'], { cwd: root, stdio: 'inherit' })
  if (build.status !== 0) process.exit(build.status ?? 1)
}

const env = {
  ...process.env,
  NUXT_SESSION_PASSWORD: sessionPassword(),
  DATABASE_PATH: process.env.DATABASE_PATH || join(dataDir, 'gloamline.sqlite'),
  SEED_DEMO: process.env.SEED_DEMO ?? '1',
  // fetch each site's forecast at start and then hourly (from the local fake unless configured)
  FORECAST_REFRESH_MINUTES: process.env.FORECAST_REFRESH_MINUTES ?? '60',
  PORT: process.env.PORT || '3000'
}
// links in mail that no request caused (reminders, notices) need the app's address
env.PUBLIC_BASE_URL = process.env.PUBLIC_BASE_URL || `http://localhost:${env.PORT}`

const children = []
if (!process.env.SMTP_URL) {
  const { startMailSink } = await import('./mail-sink.mjs')
  const sink = await startMailSink({ port: Number(process.env.MAIL_SINK_PORT || 2525), dir: join(dataDir, 'mail-sink') })
  env.SMTP_URL = sink.url
  env.GLOAMLINE_MAIL_SINK = '1'
  console.info(`[gloamline] mail goes to the local sink at ${sink.url}`)
}
if (!process.env.FORECAST_BASE_URL && existsSync(join(root, 'scripts', 'fake-forecast.mjs'))) {
  const { startFakeForecastServer } = await import('./fake-forecast.mjs')
  const fake = await startFakeForecastServer({ port: Number(process.env.FORECAST_FAKE_PORT || 3055) })
  env.FORECAST_BASE_URL = fake.url
  console.info(`[gloamline] forecasts come from the local fake at ${fake.url}`)
}

const server = spawn(process.execPath, [join(root, '.output', 'server', 'index.mjs')], { cwd: root, env, stdio: 'inherit' })
children.push(server)
console.info(`[gloamline] serving on http://localhost:${env.PORT} (demo sign-ins in README.md)`)
server.on('exit', code => process.exit(code ?? 0))
for (const signal of ['SIGINT', 'SIGTERM']) process.on(signal, () => children.forEach(c => c.kill(signal)))
