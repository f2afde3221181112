// The built server as a cluster (scripts/cluster.mjs, node:cluster): two workers share one port; one
// of them alone runs the timed jobs; a reply cached in one worker is never served after a write made
// through the other (the data stamp moves with SQLite's data_version, sqlite.org/pragma.html#pragma_data_version).
import { resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { ApiClient, AppServer } from '../support/app-server'
import { OUTPUT_DIR, signedInClient, startAppServer } from '../support/app-server'

let server: AppServer
let coordinator: ApiClient

beforeAll(async () => {
  server = await startAppServer({
    script: resolve(import.meta.dirname, '../../scripts/cluster.mjs'),
    env: {
      GLOAMLINE_WORKERS: '2',
      GLOAMLINE_OUTPUT_DIR: OUTPUT_DIR,
      // the forecast timer says once per process that runs it; nothing answers on port 9
      FORECAST_REFRESH_MINUTES: '60',
      FORECAST_REFRESH_DELAY_MS: '600000',
      REMINDER_TIMER: 'off',
      FIELD_ALERT_TIMER: 'off'
    }
  })
  await server.waitForOutput(/2 workers serving/)
  // the second worker has forked; wait until it listens too
  await server.waitForOutput(/Listening on[\s\S]*Listening on/)
  coordinator = await signedInClient(server, 'coordinator@gloamline.test')
})
afterAll(async () => {
  await server?.stop()
})

describe('the server as a cluster of two workers', () => {
  it('runs the timed jobs in one worker only, and applies the migrations and seed once', () => {
    const log = server.output()
    expect(log.match(/forecasts refresh every/g)).toHaveLength(1)
    expect(log.match(/demo scenario seeded/g)).toHaveLength(1)
    expect(log.match(/Listening on/g)).toHaveLength(2)
  })

  it('serves every read after a write with the written data, whichever worker answers', async () => {
    const week = '/api/shifts?from=2026-11-30&to=2026-12-14'
    // fill both workers' caches
    for (let i = 0; i < 6; i++) expect((await coordinator.get(week)).status).toBe(200)
    const list = (await coordinator.get(week)).body as { id: number, title: string, version: number }[]
    expect(list.length).toBeGreaterThan(0)
    for (let round = 0; round < 3; round++) {
      const current = (await coordinator.get(`/api/shifts/${list[0]!.id}`)).body as { title: string, version: number }
      const title = `Cluster check ${round}`
      const patched = await coordinator.patch(`/api/shifts/${list[0]!.id}`, { title, version: current.version })
      expect(patched.status, JSON.stringify(patched.body)).toBe(200)
      for (let i = 0; i < 6; i++) {
        const reply = await coordinator.get(week)
        expect(reply.status).toBe(200)
        expect((reply.body as { id: number, title: string }[]).find(s => s.id === list[0]!.id)?.title).toBe(title)
      }
    }
  })
})
