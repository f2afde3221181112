// The evening-before reminder: a person's shifts for one local date at each site, the light window
// there, the review decision and measures, the weather and the cautions.
import { escapeHtml, htmlCaution, htmlFigureTable, htmlHeading, htmlList, htmlPanel, htmlParagraph, htmlButton, renderMailShell, textFooter, type MailContent } from './layout'

export interface ReminderCautionProps { title: string, figure: string | null, text: string, tone: 'caution' | 'stop' }

export interface ReminderShiftProps {
  title: string
  span: string
  requirementWords: string
  lightState: string
  profileText: string
  reviewWords: string
  reviewNote: string
  mitigations: string[]
  crewmates: string[]
  notes: string
  weather: string
  cautions: ReminderCautionProps[]
}

export interface ReminderSiteProps {
  name: string
  zoneNote: string
  statusWords: string
  /** Rows of the light window: civil dawn, sunrise, solar noon, sunset, civil dusk, daylight, civil light. */
  lightRows: { label: string, value: string, note?: string }[]
  weather: string
  forecastNote: string
  shifts: ReminderShiftProps[]
}

export interface ReminderProps {
  personName: string
  dateLabel: string
  sites: ReminderSiteProps[]
  /** True when an earlier reminder for this date went out and the shifts have changed since. */
  updated: boolean
  homeUrl: string | null
  settingsUrl: string | null
}

function countShifts(props: ReminderProps) {
  return props.sites.reduce((n, s) => n + s.shifts.length, 0)
}

/** Subject line: the date, the number of shifts and where. */
export function composeReminderSubject(props: ReminderProps): string {
  const n = countShifts(props)
  const where = props.sites.length === 1 ? props.sites[0]!.name : `${props.sites.length} sites`
  return `${props.updated ? 'Updated: ' : ''}${props.dateLabel}: ${n} shift${n === 1 ? '' : 's'} at ${where}`
}

function shiftText(s: ReminderShiftProps): string {
  const lines = [
    `Shift: ${s.title}`,
    `  When: ${s.span}`,
    `  Light: ${s.requirementWords}. ${s.lightState} (${s.profileText})`,
    `  Safety review: ${s.reviewWords}`,
    ...(s.mitigations.length ? ['  Measures set in the review:', ...s.mitigations.map(m => `    - ${m}`)] : []),
    ...(s.reviewNote ? [`  Review note: ${s.reviewNote}`] : []),
    `  With: ${s.crewmates.length ? s.crewmates.join(', ') : 'nobody else (you are on your own)'}`,
    ...(s.notes ? [`  Notes: ${s.notes}`] : []),
    `  Weather: ${s.weather}`,
    ...s.cautions.flatMap(c => [`  ${c.tone === 'stop' ? 'STOP WORK' : 'CAUTION'}: ${c.title}${c.figure ? ` — ${c.figure}` : ''}`, `    ${c.text}`])
  ]
  return lines.join('\n')
}

function siteText(site: ReminderSiteProps): string {
  const width = Math.max(...site.lightRows.map(r => r.label.length)) + 2
  return [
    `== ${site.name} ==`,
    site.zoneNote,
    site.statusWords,
    ...site.lightRows.map(r => `${r.label.padEnd(width)}${r.value}${r.note ? ` (${r.note})` : ''}`),
    ...(site.weather ? [`Weather: ${site.weather}`] : []),
    site.forecastNote,
    '',
    ...site.shifts.map(shiftText)
  ].join('\n')
}

function shiftHtml(s: ReminderShiftProps): string {
  const facts = [
    htmlHeading(s.title, 19),
    `<p style="margin:0 0 8px;font-size:24px;font-weight:600;font-variant-numeric:tabular-nums">${escapeHtml(s.span)}</p>`,
    htmlParagraph(`${s.requirementWords}. ${s.lightState}.`),
    htmlParagraph(`In the shift: ${s.profileText}`, true),
    htmlParagraph(`Safety review: ${s.reviewWords}`),
    s.mitigations.length ? htmlParagraph('Measures set in the review:') + htmlList(s.mitigations) : '',
    s.reviewNote ? htmlParagraph(`Review note: ${s.reviewNote}`, true) : '',
    htmlParagraph(`With: ${s.crewmates.length ? s.crewmates.join(', ') : 'nobody else (you are on your own)'}`),
    s.notes ? htmlParagraph(`Notes: ${s.notes}`, true) : '',
    htmlParagraph(`Weather: ${s.weather}`, true),
    s.cautions.map(htmlCaution).join('')
  ]
  return htmlPanel(facts.join(''))
}

function siteHtml(site: ReminderSiteProps): string {
  return [
    htmlHeading(site.name, 22),
    htmlParagraph(site.zoneNote, true),
    htmlParagraph(site.statusWords),
    htmlFigureTable(site.lightRows),
    site.weather ? htmlParagraph(`Weather: ${site.weather}`) : '',
    htmlParagraph(site.forecastNote, true),
    site.shifts.map(shiftHtml).join('')
  ].join('')
}

/** Renders the reminder as subject, HTML and plain text. */
export function renderReminderMail(props: ReminderProps): MailContent {
  const subject = composeReminderSubject(props)
  const intro = props.updated
    ? `Your shifts for ${props.dateLabel} have changed since the last reminder. This is the current plan.`
    : `Here is your work for ${props.dateLabel} and the light at each site.`
  const links = [
    props.homeUrl ? `Your light and shifts: ${props.homeUrl}` : '',
    props.settingsUrl ? `Turn these reminders off or change the time zone: ${props.settingsUrl}` : ''
  ].filter(Boolean)
  const text = [
    subject, '', `Hello ${props.personName},`, intro, '',
    props.sites.map(siteText).join('\n\n'),
    textFooter(links)
  ].join('\n')
  const body = [
    htmlParagraph(`Hello ${props.personName},`),
    htmlParagraph(intro),
    props.sites.map(siteHtml).join(''),
    props.homeUrl ? htmlButton('Open my light and shifts', props.homeUrl) : ''
  ].join('')
  const html = renderMailShell({
    title: `Your shifts for ${props.dateLabel}`,
    preheader: subject,
    bodyHtml: body,
    footerLines: props.settingsUrl ? [`Turn these reminders off or change the time zone in your settings: ${props.settingsUrl}`] : []
  })
  return { subject, html, text }
}
