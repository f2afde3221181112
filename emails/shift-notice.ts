// The notice to a person on a shift when its time, site, light need or people change, when they are
// taken off it, or when it is cancelled.
import { htmlButton, htmlFigureTable, htmlList, htmlParagraph, renderMailShell, textFooter, type MailContent } from './layout'

export type ShiftNoticeChange = 'changed' | 'removed' | 'cancelled'

export interface ShiftNoticeProps {
  personName: string
  change: ShiftNoticeChange
  actorName: string
  shift: {
    title: string
    siteName: string
    dateLabel: string
    span: string
    requirementWords: string
    lightState: string
    reviewWords: string
    mitigations: string[]
    crewmates: string[]
  }
  homeUrl: string | null
}

const HEADLINES: Record<ShiftNoticeChange, string> = {
  changed: 'Your shift has changed',
  removed: 'You are no longer on this shift',
  cancelled: 'Your shift is cancelled'
}

const EXPLANATIONS: Record<ShiftNoticeChange, string> = {
  changed: 'The time, the site, the light it needs or the people on it were changed. This is the shift as it stands now.',
  removed: 'You were taken off this shift. Ask your coordinator if you did not expect this.',
  cancelled: 'This shift will not take place. Ask your coordinator what replaces it.'
}

/** Subject line: what happened, to which shift, when. */
export function composeShiftNoticeSubject(props: ShiftNoticeProps): string {
  const prefix = props.change === 'changed' ? 'Changed' : props.change === 'removed' ? 'Taken off' : 'Cancelled'
  return `${prefix}: ${props.shift.title}, ${props.shift.dateLabel} at ${props.shift.siteName}`
}

function factRows(props: ShiftNoticeProps): { label: string, value: string, note?: string }[] {
  const s = props.shift
  const rows: { label: string, value: string, note?: string }[] = [
    { label: 'Site', value: s.siteName },
    { label: 'Date', value: s.dateLabel },
    { label: 'Time', value: s.span }
  ]
  if (props.change !== 'changed') return rows
  return [...rows,
    { label: 'Light', value: s.requirementWords, note: s.lightState },
    { label: 'Review', value: s.reviewWords },
    { label: 'With', value: s.crewmates.length ? s.crewmates.join(', ') : 'nobody else (you are on your own)' }]
}

/** Renders the shift notice as subject, HTML and plain text. */
export function renderShiftNoticeMail(props: ShiftNoticeProps): MailContent {
  const subject = composeShiftNoticeSubject(props)
  const rows = factRows(props)
  const measures = props.change === 'changed' ? props.shift.mitigations : []
  const by = `Changed by ${props.actorName}.`
  const text = [
    subject, '', `Hello ${props.personName},`, `${HEADLINES[props.change]}. ${EXPLANATIONS[props.change]}`, '',
    `Shift: ${props.shift.title}`,
    ...rows.map(r => `${r.label}: ${r.value}${r.note ? ` (${r.note})` : ''}`),
    ...(measures.length ? ['Measures set in the review:', ...measures.map(m => `  - ${m}`)] : []),
    '', by,
    textFooter(props.homeUrl ? [`Your light and shifts: ${props.homeUrl}`] : [])
  ].join('\n')
  const html = renderMailShell({
    title: HEADLINES[props.change],
    preheader: subject,
    bodyHtml: [
      htmlParagraph(`Hello ${props.personName},`),
      htmlParagraph(EXPLANATIONS[props.change]),
      htmlParagraph(`Shift: ${props.shift.title}`),
      htmlFigureTable(rows),
      measures.length ? htmlParagraph('Measures set in the review:') + htmlList(measures) : '',
      htmlParagraph(by, true),
      props.homeUrl ? htmlButton('Open my light and shifts', props.homeUrl) : ''
    ].join('')
  })
  return { subject, html, text }
}
