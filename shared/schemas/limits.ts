// Limits the request schemas and the forms share. Pure: no imports.

/** Longest travel each way a shift or site may carry, in minutes. */
export const MAX_TRAVEL_MINUTES = 720
/** Longest shift title and site or person name, in characters. */
export const MAX_TITLE_LENGTH = 200
export const MAX_NAME_LENGTH = 120
/** Longest free-text note on a shift or site, in characters. */
export const MAX_NOTES_LENGTH = 4000
