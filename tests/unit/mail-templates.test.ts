// The mail templates: each returns a subject, an HTML part and a plain-text part with the same facts.
// The HTML is read back with a general-purpose HTML parser (happy-dom's DOMParser) to check that what
// people typed (names, notes) arrives as text, never as markup.
import { Window } from 'happy-dom'
import { describe, expect, it } from 'vitest'
import { renderReminderMail, type ReminderProps } from '../../emails/reminder'
import { renderShiftNoticeMail } from '../../emails/shift-notice'
import { renderReviewNeededMail } from '../../emails/review-needed'
import { renderInvitationMail } from '../../emails/invitation'
import { DEFERENCE_TEXT } from '../../emails/layout'

function parseHtml(html: string) {
  const window = new Window()
  const doc = new window.DOMParser().parseFromString(html, 'text/html')
  return { doc, close: () => window.close() }
}

const HOSTILE = 'Liv <script>alert(1)</script> "Aasen"'

const REMINDER: ReminderProps = {
  personName: HOSTILE,
  dateLabel: 'Thu 14 Jan',
  updated: false,
  homeUrl: 'http://127.0.0.1:3000/',
  settingsUrl: 'http://127.0.0.1:3000/settings',
  sites: [{
    name: 'Ravnvik Pipeline Yard',
    zoneNote: 'Times in the site\'s zone, Europe/Oslo',
    statusWords: 'The sun rises and sets',
    lightRows: [
      { label: 'Civil dawn', value: '09:01 UTC+01:00' },
      { label: 'Sunrise', value: '10:58 UTC+01:00' },
      { label: 'Daylight', value: '1 h 12 min', note: '+9 min since today' }
    ],
    weather: '',
    forecastNote: 'No forecast for this site yet.',
    shifts: [{
      title: 'Pipe stringing', span: '08:00–14:00 UTC+01:00', requirementWords: 'Needs daylight (sun above the horizon)',
      lightState: 'Short of its light need for 4 h 48 min', profileText: 'daylight 1 h 12 min · civil twilight 3 h 50 min · darker 58 min',
      reviewWords: 'Approved in safety review (Tomas Reyes)', reviewNote: 'Keep <b>radio</b> on', mitigations: ['Portable work lighting on site'],
      crewmates: ['Nora Tuktu'], notes: '', weather: 'No forecast.',
      cautions: [{ title: '4 h 48 min of this shift without the daylight it needs', figure: '58 min in nautical twilight or darker', text: 'Bring lights.', tone: 'caution' }]
    }]
  }]
}

describe('mail templates', () => {
  it('renders the reminder with the light window, shifts, review, cautions and deference line in both parts', () => {
    const mail = renderReminderMail(REMINDER)
    expect(mail.subject).toBe('Thu 14 Jan: 1 shift at Ravnvik Pipeline Yard')
    for (const fact of ['Sunrise', '10:58 UTC+01:00', 'Pipe stringing', '08:00–14:00 UTC+01:00', 'Approved in safety review (Tomas Reyes)', 'Portable work lighting on site', 'CAUTION', DEFERENCE_TEXT]) {
      expect(mail.text).toContain(fact)
    }
    const { doc, close } = parseHtml(mail.html)
    const text = doc.body.textContent ?? ''
    for (const fact of ['10:58 UTC+01:00', 'Pipe stringing', 'Portable work lighting on site', '58 min in nautical twilight or darker']) expect(text).toContain(fact)
    expect(text).toContain(DEFERENCE_TEXT)
    close()
  })

  it('escapes what people typed: a name or note with markup stays text in the HTML part', () => {
    const mail = renderReminderMail(REMINDER)
    const { doc, close } = parseHtml(mail.html)
    expect(doc.querySelectorAll('script')).toHaveLength(0)
    expect(doc.querySelectorAll('b')).toHaveLength(0)
    expect(doc.body.textContent).toContain('Hello Liv <script>alert(1)</script> "Aasen",')
    expect(doc.body.textContent).toContain('Keep <b>radio</b> on')
    close()
  })

  it('marks an updated reminder in its subject and first lines', () => {
    const mail = renderReminderMail({ ...REMINDER, updated: true })
    expect(mail.subject).toMatch(/^Updated: /)
    expect(mail.text).toContain('have changed since the last reminder')
  })

  it('renders the shift notices: changed, taken off, cancelled', () => {
    const shift = { title: 'Line patrol', siteName: 'Larsen Wharf Line Crew', dateLabel: 'Fri 15 Jan', span: '08:00–15:00 UTC+01:00', requirementWords: 'Needs daylight', lightState: 'Short of its light need for 1 h 20 min', reviewWords: 'Waiting for safety review', mitigations: [], crewmates: [] }
    const changed = renderShiftNoticeMail({ personName: 'Jonas Eide', change: 'changed', actorName: 'Ingrid Halvorsen', shift, homeUrl: null })
    const removed = renderShiftNoticeMail({ personName: 'Jonas Eide', change: 'removed', actorName: 'Ingrid Halvorsen', shift, homeUrl: null })
    const cancelled = renderShiftNoticeMail({ personName: 'Jonas Eide', change: 'cancelled', actorName: 'Ingrid Halvorsen', shift, homeUrl: null })
    expect(changed.subject).toBe('Changed: Line patrol, Fri 15 Jan at Larsen Wharf Line Crew')
    expect(changed.text).toContain('Time: 08:00–15:00 UTC+01:00')
    expect(changed.text).toContain('With: nobody else (you are on your own)')
    expect(removed.subject).toMatch(/^Taken off: /)
    expect(cancelled.subject).toMatch(/^Cancelled: /)
    expect(cancelled.text).toContain('will not take place')
    for (const mail of [changed, removed, cancelled]) expect(mail.html).toContain('Changed by Ingrid Halvorsen.')
  })

  it('renders the review-needed notice with how far below its light need the shift goes', () => {
    const mail = renderReviewNeededMail({
      personName: 'Tomas Reyes', reopened: false, reviewUrl: 'http://127.0.0.1:3000/review',
      shift: { title: 'Crossing inspection', siteName: 'Ravnvik Pipeline Yard', dateLabel: 'Thu 14 Jan', span: '15:00–18:00 UTC+01:00', requirementWords: 'Needs civil light', minutesBelowText: '2 h 10 min', profileText: 'civil twilight 50 min · darker 2 h 10 min', crewText: 'Sofia Marchetti (alone)' }
    })
    expect(mail.subject).toBe('Review needed: Crossing inspection, Thu 14 Jan at Ravnvik Pipeline Yard (2 h 10 min below its light need)')
    expect(mail.text).toContain('Crew: Sofia Marchetti (alone)')
    expect(mail.text).toContain('http://127.0.0.1:3000/review')
    expect(renderReviewNeededMail({ ...{ personName: 'T', reviewUrl: null, shift: { title: 'A', siteName: 'B', dateLabel: 'C', span: 'D', requirementWords: 'E', minutesBelowText: '1 min', profileText: 'F', crewText: 'G' } }, reopened: true }).subject).toMatch(/^Back for review: /)
  })

  it('renders the invitation with its one-time link in both parts', () => {
    const link = 'http://127.0.0.1:3000/welcome?token=a-b_c'
    const mail = renderInvitationMail({ personName: 'Pita Rangi', inviterName: 'Ingrid Halvorsen', roleWords: 'a safety officer', link, expiresText: 'Sat 16 Jan 20:00 UTC' })
    expect(mail.subject).toBe('Ingrid Halvorsen invited you to Gloamline')
    expect(mail.text).toContain(link)
    const { doc, close } = parseHtml(mail.html)
    expect([...doc.querySelectorAll('a')].map(a => a.getAttribute('href'))).toContain(link)
    expect(doc.body.textContent).toContain('Sat 16 Jan 20:00 UTC')
    close()
  })
})
