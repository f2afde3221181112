interface FetchErrorLike { data?: { message?: string, statusMessage?: string, data?: { issues?: { field: string, message: string }[] } }, message?: string, statusCode?: number }

/** Turns a failed $fetch into one sentence for the person, preferring the server's own message. */
export function describeFetchError(err: unknown): string {
  const e = err as FetchErrorLike
  return e?.data?.message || e?.data?.statusMessage || e?.message || 'Something went wrong. Try again.'
}

/** Maps the server's field issues onto form fields: { fieldName: message }. */
export function fieldErrorsFrom(err: unknown): Record<string, string> {
  const issues = (err as FetchErrorLike)?.data?.data?.issues ?? []
  return Object.fromEntries(issues.map(issue => [issue.field, issue.message]))
}
