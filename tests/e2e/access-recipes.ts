// A request each allowed role should succeed with (2xx), per route of the ACCESS table in
// access.test.ts. Each recipe builds what it needs first (as the coordinator), so a delete or a
// decision has its own fresh shift, crew or rotation and no recipe depends on another's leftovers.
import type { ApiClient, AppServer } from '../support/app-server'
import { utcDateOf } from '../support/clock'

export type Role = 'coordinator' | 'safety' | 'crew'
export interface RecipeRequest { path: string, body?: unknown, query?: Record<string, string> }
export interface RecipeKit {
  server: AppServer
  clients: Record<Role, ApiClient>
  ids: { crew: number, safety: number, coordinator: number, target: number, siteId: number }
  uniq: () => string
}
type Recipe = (role: Role, kit: RecipeKit) => Promise<RecipeRequest> | RecipeRequest

const HOUR = 3_600_000
const DEMO_PASSWORD = 'gloamline-demo'

async function created(client: ApiClient, path: string, body: unknown): Promise<any> {
  const reply = await client.post(path, body)
  if (reply.status >= 300) throw new Error(`fixture ${path} failed: ${reply.status} ${JSON.stringify(reply.body)}`)
  return reply.body
}

// a shift an hour from the server's now, with the crew demo account on it (and an optional light need)
async function soonShift(kit: RecipeKit, light: 'any' | 'civil' = 'any', hoursAhead = 1) {
  const start = kit.server.clock.now() + hoursAhead * HOUR
  return created(kit.clients.coordinator, '/api/shifts', {
    siteId: kit.ids.siteId, title: `Access check ${kit.uniq()}`, light, assigneeIds: [kit.ids.crew], overrideReason: 'access test',
    start: new Date(start).toISOString(), end: new Date(start + 2 * HOUR).toISOString()
  })
}

// a shift at 23:00–01:00 UTC at the dark test site: below civil light every night, so it waits for review
async function darkShift(kit: RecipeKit, daysAhead = 3) {
  const day = utcDateOf(kit.server.clock.now(), daysAhead)
  return created(kit.clients.coordinator, '/api/shifts', {
    siteId: kit.ids.siteId, title: `Dark access check ${kit.uniq()}`, light: 'civil', assigneeIds: [kit.ids.crew], overrideReason: 'access test',
    start: `${day}T23:00:00Z`, end: `${utcDateOf(kit.server.clock.now(), daysAhead + 1)}T01:00:00Z`
  })
}

function rotationBody(kit: RecipeKit) {
  return { siteId: kit.ids.siteId, title: `Access rotation ${kit.uniq()}`, light: 'civil', from: utcDateOf(kit.server.clock.now(), 20), to: utcDateOf(kit.server.clock.now(), 23), startTime: '23:00', endTime: '01:00', onDays: 2, offDays: 1, assigneeIds: [kit.ids.crew] }
}

async function newRotation(kit: RecipeKit): Promise<number> {
  return (await created(kit.clients.coordinator, '/api/rotations', rotationBody(kit))).rotation.id
}

const APPROVAL = { decision: 'approved', mitigations: ['portable-lighting'], note: 'Lit and paired (access test).' }

export const RECIPES: Record<string, Recipe> = {
  // a new password for this role's demo account (its current session stays signed in)
  'auth/password.post': (_, k) => ({ path: '/api/auth/password', body: { currentPassword: DEMO_PASSWORD, newPassword: `moraine-kettle-${k.uniq()}-dusk-lantern` } }),
  'auth/sessions.get': () => ({ path: '/api/auth/sessions' }),
  'auth/logout-others.post': () => ({ path: '/api/auth/logout-others', body: {} }),
  'auth/me.get': () => ({ path: '/api/auth/me' }),
  'people/[id]/password-link.post': (_, k) => ({ path: `/api/people/${k.ids.target}/password-link`, body: {} }),
  'people/index.get': () => ({ path: '/api/people' }),
  'people/index.post': (_, k) => ({ path: '/api/people', body: { name: 'Access Person', email: `access.${k.uniq()}@northwake.test`, role: 'crew' } }),
  'people/[id].get': (_, k) => ({ path: `/api/people/${k.ids.target}` }),
  'people/[id].patch': (_, k) => ({ path: `/api/people/${k.ids.target}`, body: { name: `Access Target ${k.uniq()}` } }),
  'sites/index.get': () => ({ path: '/api/sites' }),
  'sites/index.post': (_, k) => ({ path: '/api/sites', body: { name: `Access site ${k.uniq()}`, latitude: 69.7, longitude: 19, timezone: 'Europe/Oslo' } }),
  'sites/[id].get': (_, k) => ({ path: `/api/sites/${k.ids.siteId}` }),
  'shifts/index.get': () => ({ path: '/api/shifts' }),
  'shifts/index.post': (_, k) => ({ path: '/api/shifts', body: { siteId: k.ids.siteId, title: 'Access shift', light: 'any', start: '2027-05-02T09:00', end: '2027-05-02T11:00', assigneeIds: [] } }),
  'shifts/[id].get': async (_, k) => ({ path: `/api/shifts/${(await soonShift(k, 'any', 30)).id}` }),
  'shifts/[id].patch': async (_, k) => ({ path: `/api/shifts/${(await soonShift(k, 'any', 40)).id}`, body: { title: 'Renamed by access test' } }),
  'shifts/[id].delete': async (_, k) => ({ path: `/api/shifts/${(await soonShift(k, 'any', 50)).id}` }),
  'shifts/check.post': (_, k) => ({ path: '/api/shifts/check', body: { siteId: k.ids.siteId, title: 'Access check', light: 'civil', start: '2027-05-03T09:00', end: '2027-05-03T11:00', assigneeIds: [] } }),
  'light.get': () => ({ path: '/api/light', query: { lat: '69.65', lon: '18.96', tz: 'Europe/Oslo', from: '2027-03-27', to: '2027-03-28' } }),
  'seasons.get': () => ({ path: '/api/seasons', query: { lat: '69.65', lon: '18.96', tz: 'Europe/Oslo', year: '2027' } }),
  'sites/[id]/light.get': (_, k) => ({ path: `/api/sites/${k.ids.siteId}/light`, query: { from: '2027-03-27', to: '2027-03-28' } }),
  'sites/[id]/seasons.get': (_, k) => ({ path: `/api/sites/${k.ids.siteId}/seasons`, query: { year: '2027' } }),
  'sites/[id]/year.get': (_, k) => ({ path: `/api/sites/${k.ids.siteId}/year`, query: { year: '2027' } }),
  'sites/[id]/runup.get': (_, k) => ({ path: `/api/sites/${k.ids.siteId}/runup` }),
  'cold.get': () => ({ path: '/api/cold', query: { temperature: '-20', wind: '30', units: 'metric' } }),
  'shifts/[id]/review.post': async (_, k) => {
    const shift = await darkShift(k)
    return { path: `/api/shifts/${shift.id}/review`, body: { ...APPROVAL, version: shift.version } }
  },
  'shifts/[id]/reviews.get': async (_, k) => ({ path: `/api/shifts/${(await darkShift(k)).id}/reviews` }),
  'shifts/[id]/departure.post': async (_, k) => ({ path: `/api/shifts/${(await soonShift(k)).id}/departure`, body: {} }),
  'shifts/[id]/check-in.post': async (_, k) => {
    const shift = await soonShift(k)
    await created(k.clients.coordinator, `/api/shifts/${shift.id}/departure`, {})
    return { path: `/api/shifts/${shift.id}/check-in`, body: { note: 'All well (access test)' } }
  },
  'shifts/[id]/return.post': async (_, k) => {
    const shift = await soonShift(k)
    await created(k.clients.coordinator, `/api/shifts/${shift.id}/departure`, {})
    return { path: `/api/shifts/${shift.id}/return`, body: {} }
  },
  'shifts/[id]/field.get': async (_, k) => ({ path: `/api/shifts/${(await soonShift(k)).id}/field` }),
  'field.get': () => ({ path: '/api/field' }),
  'me/field.get': () => ({ path: '/api/me/field' }),
  'settings/field.get': () => ({ path: '/api/settings/field' }),
  'settings/field.patch': () => ({ path: '/api/settings/field', body: { overdueGraceMinutes: 30 } }),
  'review/queue.get': () => ({ path: '/api/review/queue' }),
  'review/[id].get': async (_, k) => ({ path: `/api/review/${(await darkShift(k)).id}` }),
  'review/outcomes.get': () => ({ path: '/api/review/outcomes' }),
  'sites/[id]/forecast.get': (_, k) => ({ path: `/api/sites/${k.ids.siteId}/forecast` }),
  'sites/[id]/forecast/refresh.post': (_, k) => ({ path: `/api/sites/${k.ids.siteId}/forecast/refresh`, body: {} }),
  'sites/[id]/observations/index.get': (_, k) => ({ path: `/api/sites/${k.ids.siteId}/observations` }),
  'sites/[id]/observations/index.post': (_, k) => ({ path: `/api/sites/${k.ids.siteId}/observations`, body: { at: new Date(k.server.clock.now() - HOUR).toISOString(), temperature: -14, wind: 12, units: 'metric' } }),
  'sites/[id]/observations/upload.post': (_, k) => {
    const at = new Date(k.server.clock.now() - 2 * HOUR).toISOString()
    return { path: `/api/sites/${k.ids.siteId}/observations/upload`, body: { csv: `at,temperature,wind\n${at},-15,10\n`, units: 'metric' } }
  },
  'sites/[id].patch': (_, k) => ({ path: `/api/sites/${k.ids.siteId}`, body: { notes: `Checked by the access test ${k.uniq()}` } }),
  'sites/[id]/archive.post': async (_, k) => {
    const site = await created(k.clients.coordinator, '/api/sites', { name: `Access archive ${k.uniq()}`, latitude: 70, longitude: 20, timezone: 'Europe/Oslo' })
    return { path: `/api/sites/${site.id}/archive`, body: { archived: true } }
  },
  'sites/zone-suggestion.get': () => ({ path: '/api/sites/zone-suggestion', query: { lat: '69.65', lon: '18.96' } }),
  'crews/index.get': () => ({ path: '/api/crews' }),
  'crews/index.post': (_, k) => ({ path: '/api/crews', body: { name: `Access crew ${k.uniq()}`, memberIds: [] } }),
  'crews/[id].patch': async (_, k) => ({ path: `/api/crews/${(await created(k.clients.coordinator, '/api/crews', { name: `Access crew ${k.uniq()}` })).id}`, body: { name: `Access crew ${k.uniq()}` } }),
  'crews/[id].delete': async (_, k) => ({ path: `/api/crews/${(await created(k.clients.coordinator, '/api/crews', { name: `Access crew ${k.uniq()}` })).id}` }),
  'unavailability/index.get': () => ({ path: '/api/unavailability' }),
  'unavailability/index.post': (_, k) => ({ path: '/api/unavailability', body: { personId: k.ids.target, start: '2027-06-01T00:00:00Z', end: '2027-06-02T00:00:00Z', reason: 'Access test' } }),
  'unavailability/[id].delete': async (_, k) => {
    const span = await created(k.clients.coordinator, '/api/unavailability', { personId: k.ids.target, start: '2027-06-03T00:00:00Z', end: '2027-06-04T00:00:00Z' })
    return { path: `/api/unavailability/${span.id}` }
  },
  'settings/work-rules.get': () => ({ path: '/api/settings/work-rules' }),
  'settings/work-rules.patch': () => ({ path: '/api/settings/work-rules', body: { minRestHours: 11 } }),
  'rotations/index.post': (_, k) => ({ path: '/api/rotations', body: rotationBody(k) }),
  'rotations/preview.post': (_, k) => ({ path: '/api/rotations/preview', body: rotationBody(k) }),
  'rotations/[id].get': async (_, k) => ({ path: `/api/rotations/${await newRotation(k)}` }),
  'rotations/[id].patch': async (_, k) => ({ path: `/api/rotations/${await newRotation(k)}`, body: { fromDate: utcDateOf(k.server.clock.now(), 20), title: 'Renamed rotation' } }),
  'rotations/[id].delete': async (_, k) => ({ path: `/api/rotations/${await newRotation(k)}`, query: { from: utcDateOf(k.server.clock.now(), 21) } }),
  'rotations/[id]/review.post': async (_, k) => ({ path: `/api/rotations/${await newRotation(k)}/review`, body: APPROVAL }),
  'rotations/copy-week.post': async (_, k) => {
    // a Monday two months on, with one shift in its week to copy into the next
    let day = utcDateOf(k.server.clock.now(), 60)
    while (new Date(`${day}T12:00:00Z`).getUTCDay() !== 1) day = utcDateOf(Date.parse(`${day}T12:00:00Z`), 1)
    await created(k.clients.coordinator, '/api/shifts', { siteId: k.ids.siteId, title: `Week copy ${k.uniq()}`, light: 'any', start: `${day}T09:00`, end: `${day}T11:00`, assigneeIds: [] })
    return { path: '/api/rotations/copy-week', body: { siteId: k.ids.siteId, weekStart: day, weeks: 1 } }
  },
  'rotations/index.get': (_, k) => ({ path: '/api/rotations', query: { siteId: String(k.ids.siteId), year: utcDateOf(k.server.clock.now(), 0).slice(0, 4) } }),
  'settings/holds.get': () => ({ path: '/api/settings/holds' }),
  'settings/holds.patch': async (_, k) => ({ path: '/api/settings/holds', body: { levels: (await k.clients.coordinator.get('/api/settings/holds')).body.levels } }),
  'import/shifts/template.get': () => ({ path: '/api/import/shifts/template' }),
  'import/shifts/preview.post': (_, k) => ({ path: '/api/import/shifts/preview', body: { csv: `site,title,start,end,light,assignees\nKvitfjell Ice Camp,Access import ${k.uniq()},2027-05-04 10:00,2027-05-04 11:00,any,\n` } }),
  'import/shifts/index.post': (_, k) => ({ path: '/api/import/shifts', body: { csv: `site,title,start,end,light,assignees\nKvitfjell Ice Camp,Access import ${k.uniq()},2027-05-05 10:00,2027-05-05 11:00,any,\n` } }),
  'import/people/template.get': () => ({ path: '/api/import/people/template' }),
  'import/people/preview.post': (_, k) => ({ path: '/api/import/people/preview', body: { csv: `name,email,role\nAccess Import,import.${k.uniq()}@northwake.test,crew\n` } }),
  'import/people/index.post': (_, k) => ({ path: '/api/import/people', body: { csv: `name,email,role\nAccess Import,import.${k.uniq()}@northwake.test,crew\n` } }),
  'board.get': () => ({ path: '/api/board' }),
  'slots/search.post': (_, k) => ({ path: '/api/slots/search', body: { siteId: k.ids.siteId, durationMinutes: 60, light: 'any', from: '2027-05-06', to: '2027-05-07', assigneeIds: [k.ids.target] } }),
  'reminders/run.post': () => ({ path: '/api/reminders/run', query: { date: '2027-05-08' } }),
  'outbox/index.get': () => ({ path: '/api/outbox' }),
  'outbox/[id].get': async (_, k) => {
    const listed = (await k.clients.coordinator.get('/api/outbox')).body.messages
    return { path: `/api/outbox/${listed[0].id}` }
  },
  'outbox/retry.post': () => ({ path: '/api/outbox/retry', body: {} }),
  'invitations/index.get': () => ({ path: '/api/invitations' }),
  'invitations/index.post': (_, k) => ({ path: '/api/invitations', body: { name: 'Access Invitee', email: `invitee.${k.uniq()}@northwake.test`, role: 'crew' } }),
  'me/feed.get': () => ({ path: '/api/me/feed' }),
  'me/feed/regenerate.post': () => ({ path: '/api/me/feed/regenerate', body: {} }),
  'me/preferences.get': () => ({ path: '/api/me/preferences' }),
  'me/preferences.patch': () => ({ path: '/api/me/preferences', body: { feedIncludeSun: true } }),
  'me/today.get': () => ({ path: '/api/me/today' })
}
