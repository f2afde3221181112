import ICAL from 'ical.js'
import { describe, expect, it } from 'vitest'
import { createICalCalendar, escapeICalValue, foldICalLine } from '../../server/core/calendar/ical-writer'

// RFC 5545: content lines are folded so that none exceeds 75 octets (§3.1, a fold is CRLF + one
// space); TEXT escapes backslash, semicolon, comma and line breaks (§3.3.11). The written calendar is
// read back with ical.js 2.2.1, a general iCalendar parser.
describe('the feed\'s iCalendar writer', () => {
  it('folds long lines at 75 octets, never inside a UTF-8 character, and unfolding gives the line back', () => {
    const line = `DESCRIPTION:${'Kaldt vær på Svalbard – −27 °C, 🌬 vind. '.repeat(12)}`
    const folded = foldICalLine(line)
    const physical = folded.split('\r\n').slice(0, -1)
    expect(physical.length).toBeGreaterThan(5)
    for (const part of physical) expect(Buffer.byteLength(part, 'utf8')).toBeLessThanOrEqual(75)
    // no lone surrogate at a fold: every physical line is valid UTF-16 on its own
    for (const part of physical) expect(part).toBe(Buffer.from(part, 'utf8').toString('utf8'))
    expect(folded.replace(/\r\n /g, '').replace(/\r\n$/, '')).toBe(line)
  })

  it('escapes TEXT and drops other control characters, so no value can add a line', () => {
    expect(escapeICalValue('a\\b;c,d\r\ne\nf\u0007g')).toBe('a\\\\b\\;c\\,d\\ne\\nf' + 'g')
  })

  it('writes a calendar ical.js reads back: times in UTC, text unescaped, GEO as latitude;longitude', () => {
    const calendar = createICalCalendar({ name: 'Shifts: Ada\r\nBEGIN:VEVENT', prodId: { company: 'Test', product: 'Feed' }, ttl: 3600, stampMs: Date.parse('2027-01-01T00:00:00Z') })
    calendar.createEvent({
      id: 'shift-1@test', sequence: 3, start: new Date('2027-03-27T22:00:00Z'), end: new Date('2027-03-28T03:00:00Z'),
      summary: 'Night check; valves, pumps', description: 'Line one\nLine two – with “quotes”',
      location: { title: 'Test Yard 69N', geo: { lat: 69.65, lon: 18.96 } }, status: 'TENTATIVE'
    })
    calendar.createEvent({ id: 'sun-1@test', start: '2027-06-21', allDay: true, summary: 'Midnight sun', transparency: 'TRANSPARENT' })
    const text = calendar.toString()
    // the line break in the name stays an escaped \n inside its one line (ical.js leaves X- values raw)
    expect(text).toContain('X-WR-CALNAME:Shifts: Ada\\nBEGIN:VEVENT\r\n')
    const parsed = new ICAL.Component(ICAL.parse(text))
    const [shift, sun] = parsed.getAllSubcomponents('vevent')
    const event = new ICAL.Event(shift!)
    expect(event.uid).toBe('shift-1@test')
    expect(event.startDate.toJSDate().toISOString()).toBe('2027-03-27T22:00:00.000Z')
    expect(event.duration.toSeconds()).toBe(5 * 3600)
    expect(event.summary).toBe('Night check; valves, pumps')
    expect(event.description).toBe('Line one\nLine two – with “quotes”')
    expect(shift!.getFirstPropertyValue('geo')).toEqual([69.65, 18.96])
    expect(shift!.getFirstPropertyValue('status')).toBe('TENTATIVE')
    expect(shift!.getFirstPropertyValue('sequence')).toBe(3)
    expect(new ICAL.Event(sun!).startDate.isDate).toBe(true)
    expect(sun!.getFirstPropertyValue('transp')).toBe('TRANSPARENT')
    expect(parsed.getAllSubcomponents('vevent')).toHaveLength(2)
  })
})
