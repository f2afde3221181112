import { describe, expect, it } from 'vitest'
import { findPasswordProblem, PASSWORD_MIN_LENGTH } from '../../server/core/accounts/password-policy'

// NIST SP 800-63B §5.1.1.2: memorised secrets of at least 8 characters, checked against a list of
// commonly used or compromised values; no composition rules. We ask for 10 (our own setting).
describe('password rules', () => {
  it('refuses a password shorter than the minimum', () => {
    expect(PASSWORD_MIN_LENGTH).toBeGreaterThanOrEqual(8)
    expect(findPasswordProblem('short-pw')).toMatch(/at least 10/)
  })

  it('refuses common passwords whatever their case', () => {
    expect(findPasswordProblem('Password123')).toMatch(/common/)
    expect(findPasswordProblem('1234567890')).toMatch(/common/)
  })

  it('refuses one repeated character and the e-mail name', () => {
    expect(findPasswordProblem('zzzzzzzzzzzz')).toMatch(/repeated/)
    expect(findPasswordProblem('ingrid.h-2026!', 'ingrid.h@gloamline.test')).toMatch(/e-mail/)
  })

  it('accepts a long passphrase', () => {
    expect(findPasswordProblem('snow-lantern-harbour-41')).toBeNull()
  })
})
