// The digest to a safety officer: every shift that came to review since their last digest, each with
// why (its reasons and figures), who is on it, and a link to its review page. One mail per officer per
// run, never one per shift.
import { htmlButton, htmlHeading, htmlList, htmlParagraph, renderMailShell, textFooter, type MailContent } from './layout'

export interface ReviewDigestItem {
  title: string
  siteName: string
  dateLabel: string
  span: string
  /** The review reasons in words, with their figures. */
  reasons: string[]
  crewText: string
  /** True when the shift was decided before and a change put it back in the queue. */
  reopened: boolean
  reviewUrl: string | null
}

export interface ReviewDigestProps {
  personName: string
  items: ReviewDigestItem[]
  queueUrl: string | null
}

/** Subject line: the one shift and its reasons, or how many shifts wait. */
export function composeReviewDigestSubject(props: ReviewDigestProps): string {
  const [only] = props.items
  if (props.items.length === 1 && only) {
    return `${only.reopened ? 'Back for review' : 'Review needed'}: ${only.title}, ${only.dateLabel} at ${only.siteName}`
  }
  return `Review needed: ${props.items.length} shifts`
}

function itemLines(item: ReviewDigestItem): string[] {
  return [
    `${item.title}${item.reopened ? ' (back for review after a change)' : ''}`,
    `  ${item.siteName}, ${item.dateLabel} ${item.span}`,
    ...item.reasons.map(r => `  ${r}`),
    `  Crew: ${item.crewText}`,
    item.reviewUrl ? `  Review it: ${item.reviewUrl}` : ''
  ].filter(Boolean)
}

/** Renders the digest as subject, HTML and plain text. */
export function renderReviewDigestMail(props: ReviewDigestProps): MailContent {
  const subject = composeReviewDigestSubject(props)
  const intro = props.items.length === 1
    ? 'A shift waits for your safety decision.'
    : `${props.items.length} shifts wait for your safety decision.`
  const text = [
    subject, '', `Hello ${props.personName},`, intro, '',
    ...props.items.flatMap(item => [...itemLines(item), '']),
    props.queueUrl ? `Review queue: ${props.queueUrl}` : 'Open the review queue in Gloamline.',
    textFooter()
  ].join('\n')
  const html = renderMailShell({
    title: props.items.length === 1 ? 'A shift needs your review' : 'Shifts need your review',
    preheader: subject,
    bodyHtml: [
      htmlParagraph(`Hello ${props.personName},`),
      htmlParagraph(intro),
      ...props.items.map(item => [
        htmlHeading(`${item.title}${item.reopened ? ' (back for review)' : ''}`, 17),
        htmlParagraph(`${item.siteName}, ${item.dateLabel} ${item.span}. Crew: ${item.crewText}.`),
        htmlList(item.reasons),
        item.reviewUrl ? htmlButton('Review this shift', item.reviewUrl) : ''
      ].join('')),
      props.queueUrl ? htmlButton('Open the review queue', props.queueUrl) : htmlParagraph('Open the review queue in Gloamline.')
    ].join('')
  })
  return { subject, html, text }
}
