// The notice to a coordinator when safety review rejects a shift or sends it back: the decision in
// its one word, the reviewer's note, the mitigations named, and a link to the shift in the plan.
import { REVIEW_STATE_WORDS } from '../shared/review'
import { htmlButton, htmlFigureTable, htmlList, htmlParagraph, renderMailShell, textFooter, type MailContent } from './layout'

export interface ReviewOutcomeProps {
  personName: string
  decision: 'rejected' | 'changes-requested'
  reviewerName: string
  note: string
  /** Mitigations already in words (describeMitigation). */
  mitigations: string[]
  shift: {
    title: string
    siteName: string
    dateLabel: string
    span: string
    /** The review reasons in words, with their figures. */
    reasons: string[]
  }
  shiftUrl: string | null
}

/** Subject line: the decision's word, the shift and its date. */
export function composeReviewOutcomeSubject(props: ReviewOutcomeProps): string {
  return `${REVIEW_STATE_WORDS[props.decision]} by safety review: ${props.shift.title}, ${props.shift.dateLabel} at ${props.shift.siteName}`
}

/** Renders the outcome notice as subject, HTML and plain text. */
export function renderReviewOutcomeMail(props: ReviewOutcomeProps): MailContent {
  const subject = composeReviewOutcomeSubject(props)
  const s = props.shift
  const what = props.decision === 'rejected'
    ? `${props.reviewerName} rejected this shift. It should not go ahead as planned.`
    : `${props.reviewerName} sent this shift back. Change the plan as the note asks; the change puts it back in the review queue.`
  const rows = [
    { label: 'Decision', value: REVIEW_STATE_WORDS[props.decision] },
    { label: 'Site', value: s.siteName },
    { label: 'Date', value: s.dateLabel },
    { label: 'Time', value: s.span },
    { label: 'Note', value: props.note }
  ]
  const text = [
    subject, '', `Hello ${props.personName},`, what, '',
    `Shift: ${s.title}`,
    ...rows.map(r => `${r.label}: ${r.value}`),
    ...(s.reasons.length ? ['', 'Why it went to review:', ...s.reasons.map(r => `- ${r}`)] : []),
    ...(props.mitigations.length ? ['', 'Mitigations named:', ...props.mitigations.map(m => `- ${m}`)] : []),
    '',
    props.shiftUrl ? `Open the shift: ${props.shiftUrl}` : 'Open the shift in Gloamline.',
    textFooter()
  ].join('\n')
  const html = renderMailShell({
    title: props.decision === 'rejected' ? 'A shift was rejected' : 'A shift was sent back',
    preheader: subject,
    bodyHtml: [
      htmlParagraph(`Hello ${props.personName},`),
      htmlParagraph(what),
      htmlParagraph(`Shift: ${s.title}`),
      htmlFigureTable(rows),
      s.reasons.length ? htmlParagraph('Why it went to review:') + htmlList(s.reasons) : '',
      props.mitigations.length ? htmlParagraph('Mitigations named:') + htmlList(props.mitigations) : '',
      props.shiftUrl ? htmlButton('Open the shift', props.shiftUrl) : htmlParagraph('Open the shift in Gloamline.')
    ].join('')
  })
  return { subject, html, text }
}
