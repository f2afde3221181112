// Password rules for passwords people choose (invitations, resets): a minimum length and a refusal
// of the most common choices. Length over complexity rules follows current common practice
// (NIST SP 800-63B: at least 8 characters, check against commonly used passwords); we ask for 10.
export const PASSWORD_MIN_LENGTH = 10
export const PASSWORD_MAX_LENGTH = 256

// a short list of the most used passwords (common practice: block the obvious ones), lower-case
const COMMON_PASSWORDS = new Set([
  '123456', '123456789', '12345678', '1234567890', 'password', 'password1', 'password123', 'qwerty',
  'qwerty123', 'qwertyuiop', '111111', '000000', 'abc123', 'iloveyou', 'admin', 'admin123', 'welcome',
  'welcome1', 'letmein', 'monkey', 'dragon', 'football', 'baseball', 'sunshine', 'princess', 'master',
  'superman', 'trustno1', 'passw0rd', 'p@ssw0rd', 'changeme', 'secret', 'winter2026', 'summer2026',
  'gloamline', 'gloamline1', 'gloamline-demo', '1q2w3e4r', '1qaz2wsx', 'zaq12wsx', 'asdfghjkl',
  'qwertyuiop1', 'password12', 'password1234', 'aaaaaaaaaa', '0123456789', '9876543210'
])

/** Why a chosen password is refused, or null when it passes the rules. */
export function findPasswordProblem(password: string, email?: string): string | null {
  if (password.length < PASSWORD_MIN_LENGTH) return `must be at least ${PASSWORD_MIN_LENGTH} characters`
  if (password.length > PASSWORD_MAX_LENGTH) return `must be at most ${PASSWORD_MAX_LENGTH} characters`
  const lower = password.toLowerCase()
  if (COMMON_PASSWORDS.has(lower)) return 'is one of the most common passwords; choose another'
  if (/^(.)\1+$/.test(password)) return 'must not be one repeated character'
  if (email && lower.includes(email.split('@')[0]!.toLowerCase())) return 'must not contain your e-mail name'
  return null
}
