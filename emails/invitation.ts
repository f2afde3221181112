// The invitation: a one-time link to set a password and start using Gloamline with a given role.
import { htmlButton, htmlFigureTable, htmlParagraph, renderMailShell, textFooter, type MailContent } from './layout'

export interface InvitationProps {
  personName: string
  inviterName: string
  roleWords: string
  link: string
  expiresText: string
}

/** Subject line of the invitation. */
export function composeInvitationSubject(props: InvitationProps): string {
  return `${props.inviterName} invited you to Gloamline`
}

/** Renders the invitation as subject, HTML and plain text. */
export function renderInvitationMail(props: InvitationProps): MailContent {
  const subject = composeInvitationSubject(props)
  const what = `${props.inviterName} has invited you to Gloamline as ${props.roleWords}. Gloamline plans field shifts around the light at high-latitude sites.`
  const how = `Open the link below to choose your password. It works once, until ${props.expiresText}.`
  const ignore = 'If you did not expect this, ignore this message: nothing happens until the link is used.'
  const text = [
    subject, '', `Hello ${props.personName},`, what, how, '', props.link, '', ignore,
    textFooter()
  ].join('\n')
  const html = renderMailShell({
    title: 'You are invited to Gloamline',
    preheader: `${what} ${how}`,
    bodyHtml: [
      htmlParagraph(`Hello ${props.personName},`),
      htmlParagraph(what),
      htmlFigureTable([{ label: 'Role', value: props.roleWords }, { label: 'Link works until', value: props.expiresText }]),
      htmlParagraph(how),
      htmlButton('Choose my password', props.link),
      htmlParagraph(`Or copy this address into your browser: ${props.link}`, true),
      htmlParagraph(ignore, true)
    ].join('')
  })
  return { subject, html, text }
}
