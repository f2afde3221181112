// The frame every Gloamline message shares: a plain table layout with inline styles (mail clients
// ignore style sheets), our colours, big figures, and the deference line. Every value that reaches
// the HTML goes through escapeHtml.
import type { MailContent } from '../server/adapters/mail'

export type { MailContent }

const INK = '#16213a'
const SNOW = '#f5f8fb'
const FROST = '#dfe8f1'
const EMBER = '#b84c15'
const SIGNAL = '#b3261e'
const MUTED = '#4a5a72'
const FONT = '\'Work Sans\', \'Segoe UI\', Arial, sans-serif'

/** Our own words: the tool advises, local rules and competent people decide. */
export const DEFERENCE_TEXT = 'Gloamline works these figures out from the sun\'s position and from published cold-exposure formulas and guidelines. They help you plan; they never say that work is safe. The law that applies at the site, your employer\'s procedures, what you see on site and a competent supervisor decide. Where a local rule is stricter, it applies.'

/** Escapes text for HTML element content and attribute values. */
export function escapeHtml(value: string): string {
  return value.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;')
}

/** A heading inside the card. */
export function htmlHeading(text: string, size = 20): string {
  return `<h2 style="margin:24px 0 8px;font-size:${size}px;line-height:1.3;color:${INK};font-weight:600">${escapeHtml(text)}</h2>`
}

/** A paragraph of body text (17 px). */
export function htmlParagraph(text: string, muted = false): string {
  return `<p style="margin:0 0 12px;font-size:17px;line-height:1.55;color:${muted ? MUTED : INK}">${escapeHtml(text)}</p>`
}

/** A list of plain lines. */
export function htmlList(items: string[]): string {
  if (!items.length) return ''
  return `<ul style="margin:0 0 12px;padding-left:22px;font-size:17px;line-height:1.55;color:${INK}">${items.map(i => `<li>${escapeHtml(i)}</li>`).join('')}</ul>`
}

/** A two-column table of labels and big figures (times, durations). */
export function htmlFigureTable(rows: { label: string, value: string, note?: string }[]): string {
  // figures (times, durations) in big type; words ("none: polar night", a name) at body size
  const size = (value: string) => /^[\d−+-]/.test(value) ? 24 : 17
  const cells = rows.map(r => `<tr>
<td style="padding:6px 12px 6px 0;font-size:17px;color:${MUTED};white-space:nowrap;vertical-align:top">${escapeHtml(r.label)}</td>
<td style="padding:6px 0;font-size:${size(r.value)}px;line-height:1.25;font-weight:600;color:${INK};font-variant-numeric:tabular-nums">${escapeHtml(r.value)}${r.note ? `<div style="font-size:15px;font-weight:400;color:${MUTED}">${escapeHtml(r.note)}</div>` : ''}</td>
</tr>`).join('')
  return `<table role="presentation" cellpadding="0" cellspacing="0" style="border-collapse:collapse;margin:0 0 12px">${cells}</table>`
}

/** A caution box: amber edge and a marker word (the strongest style only for stop-work). */
export function htmlCaution(caution: { title: string, figure?: string | null, text: string, tone?: 'caution' | 'stop' }): string {
  const edge = caution.tone === 'stop' ? SIGNAL : EMBER
  const word = caution.tone === 'stop' ? 'STOP WORK' : 'CAUTION'
  return `<div style="margin:0 0 12px;padding:12px 14px;border-left:6px solid ${edge};background:#fbeee4">
<p style="margin:0;font-size:15px;font-weight:600;letter-spacing:0.04em;color:${edge}">&#9888; ${word}</p>
<p style="margin:4px 0 0;font-size:17px;font-weight:600;color:${INK}">${escapeHtml(caution.title)}</p>
${caution.figure ? `<p style="margin:4px 0 0;font-size:22px;font-weight:600;color:${INK};font-variant-numeric:tabular-nums">${escapeHtml(caution.figure)}</p>` : ''}
<p style="margin:4px 0 0;font-size:16px;line-height:1.5;color:${INK}">${escapeHtml(caution.text)}</p>
</div>`
}

/** A block with a frost background (a shift, a summary). */
export function htmlPanel(inner: string): string {
  return `<div style="margin:0 0 14px;padding:14px;background:${FROST};border-radius:6px">${inner}</div>`
}

/** A button-like link (44 px tall, our accent). */
export function htmlButton(label: string, href: string): string {
  return `<p style="margin:16px 0"><a href="${escapeHtml(href)}" style="display:inline-block;padding:12px 20px;min-height:20px;background:${EMBER};color:#ffffff;font-size:17px;font-weight:600;text-decoration:none;border-radius:6px">${escapeHtml(label)}</a></p>`
}

/** Wraps a message body in the shared frame; `preheader` is the line mail clients show after the subject. */
export function renderMailShell(input: { title: string, preheader: string, bodyHtml: string, footerLines?: string[] }): string {
  const footer = [DEFERENCE_TEXT, ...(input.footerLines ?? [])].map(line => `<p style="margin:0 0 8px;font-size:14px;line-height:1.5;color:${MUTED}">${escapeHtml(line)}</p>`).join('')
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><meta name="color-scheme" content="light"><title>${escapeHtml(input.title)}</title></head>
<body style="margin:0;padding:0;background:${SNOW};font-family:${FONT}">
<div style="display:none;max-height:0;overflow:hidden">${escapeHtml(input.preheader)}</div>
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="background:${SNOW}"><tr><td align="center" style="padding:16px 8px">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="max-width:600px;background:#ffffff;border:1px solid ${FROST};border-radius:8px">
<tr><td style="background:${INK};padding:14px 20px;border-radius:8px 8px 0 0;border-bottom:4px solid ${EMBER}">
<span style="font-size:22px;font-weight:600;letter-spacing:0.03em;color:${SNOW}">&#9683; Gloamline</span></td></tr>
<tr><td style="padding:8px 20px 16px;font-family:${FONT}">
<h1 style="margin:16px 0 12px;font-size:26px;line-height:1.3;color:${INK};font-weight:600">${escapeHtml(input.title)}</h1>
${input.bodyHtml}
</td></tr>
<tr><td style="padding:14px 20px;border-top:1px solid ${FROST}">${footer}</td></tr>
</table></td></tr></table>
</body></html>`
}

/** The plain-text deference block, for the text part of every message. */
export function textFooter(lines: string[] = []): string {
  return ['', '—', DEFERENCE_TEXT, ...lines].join('\n')
}
