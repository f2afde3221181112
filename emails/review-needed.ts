// The notice to safety officers when work is newly flagged: part of a shift falls below the light
// its task needs, and it waits for a decision.
import { htmlButton, htmlFigureTable, htmlParagraph, renderMailShell, textFooter, type MailContent } from './layout'

export interface ReviewNeededProps {
  personName: string
  shift: {
    title: string
    siteName: string
    dateLabel: string
    span: string
    requirementWords: string
    minutesBelowText: string
    profileText: string
    crewText: string
  }
  /** True when the shift was decided before and a later change put it back in the queue. */
  reopened: boolean
  reviewUrl: string | null
}

/** Subject line: the shift, the date and how far below its light need it goes. */
export function composeReviewNeededSubject(props: ReviewNeededProps): string {
  return `${props.reopened ? 'Back for review' : 'Review needed'}: ${props.shift.title}, ${props.shift.dateLabel} at ${props.shift.siteName} (${props.shift.minutesBelowText} below its light need)`
}

/** Renders the review-needed notice as subject, HTML and plain text. */
export function renderReviewNeededMail(props: ReviewNeededProps): MailContent {
  const subject = composeReviewNeededSubject(props)
  const s = props.shift
  const why = props.reopened
    ? 'This shift was changed after an earlier decision, and the change puts it back in the review queue.'
    : 'Part of this shift falls below the light its task needs, so it waits for a safety decision.'
  const rows = [
    { label: 'Site', value: s.siteName },
    { label: 'Date', value: s.dateLabel },
    { label: 'Time', value: s.span },
    { label: 'Needs', value: s.requirementWords },
    { label: 'Below', value: s.minutesBelowText, note: s.profileText },
    { label: 'Crew', value: s.crewText }
  ]
  const text = [
    subject, '', `Hello ${props.personName},`, why, '',
    `Shift: ${s.title}`,
    ...rows.map(r => `${r.label}: ${r.value}${r.note ? ` (${r.note})` : ''}`),
    '',
    props.reviewUrl ? `Review queue: ${props.reviewUrl}` : 'Open the review queue in Gloamline.',
    textFooter()
  ].join('\n')
  const html = renderMailShell({
    title: props.reopened ? 'A shift is back for review' : 'A shift needs your review',
    preheader: subject,
    bodyHtml: [
      htmlParagraph(`Hello ${props.personName},`),
      htmlParagraph(why),
      htmlParagraph(`Shift: ${s.title}`),
      htmlFigureTable(rows),
      props.reviewUrl ? htmlButton('Open the review queue', props.reviewUrl) : htmlParagraph('Open the review queue in Gloamline.')
    ].join('')
  })
  return { subject, html, text }
}
