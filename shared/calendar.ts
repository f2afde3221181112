// Builds what the plan calendar draws: the light bands behind the shifts and the shifts themselves.
// The calendar runs in UTC and is fed the wall clock of the display zone written as UTC, so that any
// IANA zone shows correctly without a zone plugin (see components/calendar/CalendarBoard.client.vue).
import type { EventInput } from '@fullcalendar/core'
import type { LightDay } from './light'
import { addDays, formatDuration, toWallClock } from './format'
import { describeLightState, type ShiftReply, type SiteItem } from './planning'

export interface SiteLight { site: SiteItem, days: LightDay[] }

/** The dates a view covers, `from` inclusive and `to` exclusive: a Monday-first week, or the six-week month grid. */
export function calendarRange(view: 'week' | 'month', date: string): { from: string, to: string } {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number]
  const anchor = view === 'week' ? new Date(Date.UTC(y, m - 1, d)) : new Date(Date.UTC(y, m - 1, 1))
  // ISO 8601 weeks start on Monday
  const back = (anchor.getUTCDay() + 6) % 7
  const from = addDays(anchor.toISOString().slice(0, 10), -back)
  return { from, to: addDays(from, view === 'week' ? 7 : 42) }
}

/** The light periods of every chosen site as background events, one lane per site. */
export function buildBandEvents(lights: SiteLight[], zone: string): EventInput[] {
  return lights.flatMap(({ site, days }, lane) => days.flatMap(day => day.periods.map(period => ({
    id: `band-${site.id}-${period.start}`,
    start: toWallClock(period.start, zone),
    end: toWallClock(period.end, zone),
    display: 'background',
    classNames: ['gl-band', `gl-band-${period.kind}`],
    extendedProps: { band: period.kind, lane, lanes: lights.length, siteName: site.name }
  }))))
}

/** Shifts as calendar events, with their light state as a class (the chip also says it in words). */
export function buildShiftEvents(shifts: ShiftReply[], zone: string, editable: boolean): EventInput[] {
  return shifts.filter(s => !s.cancelled).map(shift => ({
    id: String(shift.id),
    title: shift.title,
    start: toWallClock(shift.start, zone),
    end: toWallClock(shift.end, zone),
    editable,
    classNames: ['gl-shift', `gl-shift-${describeLightState(shift).key}`],
    extendedProps: { shift }
  }))
}

/** One line per site for a day's header: how much daylight and civil light it has. */
export function summariseDay(lights: SiteLight[], date: string): { siteName: string, text: string }[] {
  return lights.map(({ site, days }) => {
    const day = days.find(d => d.date === date)
    if (!day) return { siteName: site.name, text: 'No light data' }
    if (day.status === 'midnight-sun') return { siteName: site.name, text: 'Midnight sun' }
    const civil = `civil light ${formatDuration(day.civilLightMinutes)}`
    if (day.status === 'polar-night') return { siteName: site.name, text: `Polar night, ${civil}` }
    return { siteName: site.name, text: `Daylight ${formatDuration(day.daylightMinutes)}` }
  })
}

/** A calendar date from FullCalendar (wall clock written as UTC) back to `YYYY-MM-DDTHH:mm`. */
export function wallFromCalendarDate(date: Date): string {
  return date.toISOString().slice(0, 16)
}
