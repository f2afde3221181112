// The three roles, defined once: the database enum (server/db/schema.ts), the session user's type,
// the request schemas and the screens all derive from this list. Pure: no imports.

/** coordinator: plans work; safety: reviews it; crew: does it. */
export const ROLES = ['coordinator', 'safety', 'crew'] as const
export type Role = typeof ROLES[number]
