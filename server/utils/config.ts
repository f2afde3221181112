// Configuration, read once from the environment. The names are the documented ones (README,
// "Configuration"); everything else in the server asks this module rather than process.env.
import { getRequestURL, type H3Event } from 'h3'
import { nowDate, nowMs } from '../core/time/clock'

export { nowDate, nowMs }

function positiveNumber(value: string | undefined): number | null {
  const n = Number(value)
  return value !== undefined && value !== '' && Number.isFinite(n) && n > 0 ? n : null
}

function readEnv(env: Record<string, string | undefined>) {
  return {
    databasePath: env.DATABASE_PATH || '.data/gloamline.sqlite',
    migrationsDir: env.MIGRATIONS_DIR || '',
    databaseReadOnly: env.DATABASE_READ_ONLY === '1',
    smtpUrl: env.SMTP_URL || `smtp://127.0.0.1:${env.MAIL_SINK_PORT || 2525}`,
    mailFrom: env.MAIL_FROM || 'Gloamline <notices@gloamline.test>',
    publicBaseUrl: (env.PUBLIC_BASE_URL || env.NUXT_PUBLIC_BASE_URL || '').replace(/\/+$/, ''),
    sessionPassword: env.NUXT_SESSION_PASSWORD || '',
    seedDemo: env.SEED_DEMO === '1',
    requestLog: env.REQUEST_LOG !== 'off',
    reminderTimer: env.REMINDER_TIMER !== 'off',
    // in a cluster (scripts/cluster.mjs) worker 0 alone runs the reminder and forecast timers; a
    // single process (GLOAMLINE_WORKER unset) runs them itself
    timerWorker: !env.GLOAMLINE_WORKER || env.GLOAMLINE_WORKER === '0',
    reminderIntervalMs: Math.max(positiveNumber(env.REMINDER_TIMER_INTERVAL_MS) ?? 60_000, 100),
    // the field alert check runs at least once a minute (docs/api.md); FIELD_ALERT_TIMER=off stops it
    fieldAlertTimer: env.FIELD_ALERT_TIMER !== 'off',
    fieldAlertIntervalMs: Math.min(Math.max(positiveNumber(env.FIELD_ALERT_INTERVAL_MS) ?? 30_000, 100), 60_000),
    mailRetryBaseMs: positiveNumber(env.MAIL_RETRY_BASE_MS),
    forecastBaseUrl: env.FORECAST_BASE_URL || '',
    forecastTimeoutMs: positiveNumber(env.FORECAST_TIMEOUT_MS) ?? 5000,
    forecastRefreshMinutes: positiveNumber(env.FORECAST_REFRESH_MINUTES),
    forecastRefreshDelayMs: env.FORECAST_REFRESH_DELAY_MS !== undefined && Number(env.FORECAST_REFRESH_DELAY_MS) >= 0 ? Number(env.FORECAST_REFRESH_DELAY_MS) : 5_000,
    // Test clock: honoured only together with GLOAMLINE_TEST_MODE=1, which tests/support/app-server.ts
    // sets and `npm start` never does, so a stray variable cannot move a real server's clock.
    testClockStart: env.GLOAMLINE_TEST_MODE === '1' && env.GLOAMLINE_CLOCK_START ? Date.parse(env.GLOAMLINE_CLOCK_START) : null
  }
}

export type AppConfig = ReturnType<typeof readEnv>
let cached: AppConfig | null = null

/** The server's configuration, read from the environment on first use. */
export function useServerConfig(): AppConfig {
  if (!cached) cached = readEnv(process.env)
  return cached
}

/** Forgets the cached configuration (tests that change the environment). */
export function resetServerConfig() {
  cached = null
}

/**
 * The address people reach the app at, for links in mail. PUBLIC_BASE_URL wins (set it in
 * production: a request's Host header is only as trustworthy as the proxy in front of the app);
 * otherwise the origin of the request that caused the mail; null when there is neither (the timer).
 */
export function resolvePublicBaseUrl(event?: H3Event): string | null {
  const configured = useServerConfig().publicBaseUrl
  if (configured) return configured
  if (!event) return null
  return getRequestURL(event).origin
}
