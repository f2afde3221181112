// One-time links (invitations, password resets) must not sit readable in the outbox: anyone who can
// read a stored message (a coordinator on the outbox page, a copy of the database) could use another
// person's link. The stored body therefore carries a placeholder, and the link itself is kept only
// sealed (AES-256-GCM under a key derived from the server secret, which never reaches the database).
// The outbox puts the link back into the body at the moment it hands the mail to SMTP.
// Explicit imports only, so unit tests can run it.
import { createCipheriv, createDecipheriv, hkdfSync, randomBytes } from 'node:crypto'
import { useServerConfig } from '../utils/config'

/** What the stored body shows in place of the link. */
export const LINK_PLACEHOLDER = '[one-time link: only in the mail as sent]'
const SEAL_INFO = 'gloamline-mail-link'

function sealKey(secret: string): Buffer {
  if (!secret || secret.length < 32) throw new Error('the server secret is not set: mail links cannot be sealed')
  return Buffer.from(hkdfSync('sha256', secret, 'gloamline', SEAL_INFO, 32))
}

/** Seals a link under the server secret: base64url of iv | tag | ciphertext. */
export function sealMailLink(link: string, secret: string): string {
  const iv = randomBytes(12)
  const cipher = createCipheriv('aes-256-gcm', sealKey(secret), iv)
  const body = Buffer.concat([cipher.update(link, 'utf8'), cipher.final()])
  return Buffer.concat([iv, cipher.getAuthTag(), body]).toString('base64url')
}

/** Opens a sealed link; throws when the secret differs or the seal was altered. */
export function openMailLink(sealed: string, secret: string): string {
  const raw = Buffer.from(sealed, 'base64url')
  const decipher = createDecipheriv('aes-256-gcm', sealKey(secret), raw.subarray(0, 12))
  decipher.setAuthTag(raw.subarray(12, 28))
  return Buffer.concat([decipher.update(raw.subarray(28)), decipher.final()]).toString('utf8')
}

function escapeForHtml(value: string) {
  return value.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;')
}

/** The body to send: the placeholder replaced by the opened link when the message carries a sealed one. */
export function revealMailLink(message: { html: string, text: string, meta: Record<string, unknown> | null }, secret = useServerConfig().sessionPassword): { html: string, text: string } {
  const sealed = message.meta?.sealedLink
  if (typeof sealed !== 'string') return { html: message.html, text: message.text }
  const link = openMailLink(sealed, secret)
  return { html: message.html.split(LINK_PLACEHOLDER).join(escapeForHtml(link)), text: message.text.split(LINK_PLACEHOLDER).join(link) }
}
