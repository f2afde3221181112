// The alert to safety officers and coordinators when a party is overdue or a lone worker has missed a
// check-in. One message per escalation step; the words say which step and what is known.
import { FIELD_DEFERENCE_LINE } from '../shared/field'
import { htmlButton, htmlCaution, htmlFigureTable, htmlParagraph, renderMailShell, textFooter, type MailContent } from './layout'

export interface FieldAlertProps {
  personName: string
  kind: 'overdue' | 'check-in-missed'
  step: number
  party: {
    title: string
    siteName: string
    people: string
    /** Times with their zone, e.g. "Tue 14 Jan 08:30 (UTC+01:00)". */
    departedText: string
    expectedBackText: string
    lastCheckInText: string
    /** "1 h 10 min", how long the alert has stood. */
    sinceText: string
  }
  boardUrl: string | null
}

const HEADLINE = {
  'overdue': 'Party overdue',
  'check-in-missed': 'Lone worker: check-in missed'
} as const

/** Subject line: the alert, its step, the shift and the site. */
export function composeFieldAlertSubject(props: FieldAlertProps): string {
  const step = props.step > 1 ? ` (reminder ${props.step - 1})` : ''
  return `${HEADLINE[props.kind]}${step}: ${props.party.title} at ${props.party.siteName}`
}

/** Renders the field alert as subject, HTML and plain text. */
export function renderFieldAlertMail(props: FieldAlertProps): MailContent {
  const subject = composeFieldAlertSubject(props)
  const p = props.party
  const what = props.kind === 'overdue'
    ? `${p.people} ${p.people.includes(',') ? 'are' : 'is'} not back from “${p.title}” at ${p.siteName}, and the grace period after the expected return has passed.`
    : `${p.people}, working alone on “${p.title}” at ${p.siteName}, has not checked in within the agreed interval.`
  const act = 'Try to reach them now, and follow your operator\'s overdue-party procedure. This message repeats at each escalation step until they are recorded back (or check in).'
  const rows = [
    { label: 'People', value: p.people },
    { label: 'Left', value: p.departedText },
    { label: 'Expected back', value: p.expectedBackText },
    { label: 'Last check-in', value: p.lastCheckInText },
    { label: 'Alert standing for', value: p.sinceText }
  ]
  const text = [
    subject, '', `Hello ${props.personName},`, what, act, '',
    ...rows.map(r => `${r.label}: ${r.value}`),
    '',
    props.boardUrl ? `Field board: ${props.boardUrl}` : 'Open the field board in Gloamline.',
    '',
    FIELD_DEFERENCE_LINE,
    textFooter()
  ].join('\n')
  const html = renderMailShell({
    title: HEADLINE[props.kind],
    preheader: subject,
    bodyHtml: [
      htmlParagraph(`Hello ${props.personName},`),
      htmlCaution({ title: HEADLINE[props.kind] + (props.step > 1 ? `, step ${props.step}` : ''), figure: `${p.sinceText} since the alert`, text: what }),
      htmlParagraph(act),
      htmlFigureTable(rows),
      props.boardUrl ? htmlButton('Open the field board', props.boardUrl) : htmlParagraph('Open the field board in Gloamline.'),
      htmlParagraph(FIELD_DEFERENCE_LINE, true)
    ].join('')
  })
  return { subject, html, text }
}
