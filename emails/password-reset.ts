// A one-time link to choose a new password: asked for on the sign-in page, or sent by a coordinator.
import { htmlButton, htmlFigureTable, htmlParagraph, renderMailShell, textFooter, type MailContent } from './layout'

export interface PasswordResetProps {
  personName: string
  // who asked: null when the person asked for it themselves
  senderName: string | null
  link: string
  expiresText: string
}

/** Renders the reset mail as subject, HTML and plain text. */
export function renderPasswordResetMail(props: PasswordResetProps): MailContent {
  const subject = 'Choose a new Gloamline password'
  const why = props.senderName
    ? `${props.senderName} sent you a link to choose a new password for Gloamline.`
    : 'Someone (we hope you) asked for a new password for your Gloamline account.'
  const how = `Open the link below to choose it. The link works once, until ${props.expiresText}. Choosing a new password signs you out everywhere else.`
  const ignore = 'If you did not ask for this, ignore this message: your password stays as it is.'
  const text = [subject, '', `Hello ${props.personName},`, why, how, '', props.link, '', ignore, textFooter()].join('\n')
  const html = renderMailShell({
    title: subject,
    preheader: `${why} ${how}`,
    bodyHtml: [
      htmlParagraph(`Hello ${props.personName},`),
      htmlParagraph(why),
      htmlFigureTable([{ label: 'Link works until', value: props.expiresText }]),
      htmlParagraph(how),
      htmlButton('Choose a new password', props.link),
      htmlParagraph(`Or copy this address into your browser: ${props.link}`, true),
      htmlParagraph(ignore, true)
    ].join('')
  })
  return { subject, html, text }
}
