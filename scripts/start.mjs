// The demo start: build, keep a session secret under .data/, start the local mail sink and
// forecast fake (unless real ones are configured), then serve. Migrations and the demo seed run
// inside the server at start-up; seeding only ever touches an empty database. The sink and the fake
// take a free port when their usual one (2525, 3055) is taken and say so; any failure to start is
// one sentence on stderr and exit code 1, never a stack trace.
import { spawn, spawnSync } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { describeStartError, isPortFree, startOnPreferredPort } from './ports.mjs'

const root = resolve(import.meta.dirname, '..')
const dataDir = join(root, '.data')
// the build output: .output, or the folder GLOAMLINE_OUTPUT_DIR names (nuxt.config.ts builds there)
const outputDir = resolve(root, process.env.GLOAMLINE_OUTPUT_DIR || '.output')

/** Ends the start with one clear sentence. */
function fail(sentence) {
  console.error(`[gloamline] could not start: ${sentence}`)
  process.exit(1)
}

function sessionPassword() {
  if (process.env.NUXT_SESSION_PASSWORD) return process.env.NUXT_SESSION_PASSWORD
  const file = join(dataDir, 'session-password')
  if (!existsSync(file)) writeFileSync(file, randomBytes(32).toString('hex'), { mode: 0o600 })
  return readFileSync(file, 'utf8').trim()
}

function readPort(name, fallback) {
  const raw = process.env[name]
  if (raw === undefined || raw === '') return fallback
  const port = Number(raw)
  if (!Number.isInteger(port) || port < 0 || port > 65535) fail(`${name}=${raw} is not a port number (0–65535).`)
  return port
}

async function main() {
  mkdirSync(dataDir, { recursive: true })
  if (process.env.SKIP_BUILD !== '1') {
    const build = spawnSync('npx', ['nuxt', 'build'], { cwd: root, stdio: 'inherit' })
    if (build.status !== 0) fail('the build failed (its messages are above); nothing was started.')
  }
  const serverEntry = join(outputDir, 'server', 'index.mjs')
  if (!existsSync(serverEntry)) fail(`there is no build at ${outputDir}: run without SKIP_BUILD=1 once.`)

  const appPort = readPort('PORT', 3000)
  if (appPort !== 0 && !(await isPortFree(appPort))) fail(`port ${appPort} is taken by another program; stop it or choose another, e.g. PORT=${appPort + 100} npm start.`)

  const env = {
    ...process.env,
    NUXT_SESSION_PASSWORD: sessionPassword(),
    DATABASE_PATH: process.env.DATABASE_PATH || join(dataDir, 'gloamline.sqlite'),
    SEED_DEMO: process.env.SEED_DEMO ?? '1',
    // fetch each site's forecast at start and then hourly (from the local fake unless configured)
    FORECAST_REFRESH_MINUTES: process.env.FORECAST_REFRESH_MINUTES ?? '60',
    PORT: String(appPort)
  }
  // links in mail that no request caused (reminders, notices) need the app's address
  env.PUBLIC_BASE_URL = process.env.PUBLIC_BASE_URL || `http://localhost:${env.PORT}`

  const closers = []
  if (!process.env.SMTP_URL) {
    const { startMailSink } = await import('./mail-sink.mjs')
    const { service: sink, note } = await startOnPreferredPort('the local mail sink', readPort('MAIL_SINK_PORT', 2525),
      port => startMailSink({ port, dir: join(dataDir, 'mail-sink') }))
    closers.push(sink.close)
    env.SMTP_URL = sink.url
    env.MAIL_SINK_PORT = String(sink.port)
    env.GLOAMLINE_MAIL_SINK = '1'
    if (note) console.info(`[gloamline] ${note}`)
    console.info(`[gloamline] mail goes to the local sink at ${sink.url}`)
  }
  if (!process.env.FORECAST_BASE_URL && existsSync(join(root, 'scripts', 'fake-forecast.mjs'))) {
    const { startFakeForecastServer } = await import('./fake-forecast.mjs')
    const { service: fake, note } = await startOnPreferredPort('the local forecast fake', readPort('FORECAST_FAKE_PORT', 3055),
      port => startFakeForecastServer({ port }))
    closers.push(fake.close)
    env.FORECAST_BASE_URL = fake.url
    env.FORECAST_FAKE_PORT = String(fake.port)
    if (note) console.info(`[gloamline] ${note}`)
    console.info(`[gloamline] forecasts come from the local fake at ${fake.url}`)
  }

  // one worker per core sharing the port (scripts/cluster.mjs; GLOAMLINE_WORKERS=1 for one process)
  const server = spawn(process.execPath, [join(root, 'scripts', 'cluster.mjs')], { cwd: root, env, stdio: 'inherit' })
  console.info(`[gloamline] serving on http://localhost:${env.PORT} (demo sign-ins in README.md)`)
  server.on('error', err => fail(`the server process could not be started: ${describeStartError(err)}.`))
  server.on('exit', async (code, signal) => {
    await Promise.all(closers.map(close => close().catch(() => {})))
    if (code && code !== 0) fail(`the server stopped with exit code ${code} (its last messages are above).`)
    process.exit(signal ? 0 : code ?? 0)
  })
  for (const name of ['SIGINT', 'SIGTERM']) process.on(name, () => server.kill(name))
}

main().catch(err => fail(`${describeStartError(err)}.`))
