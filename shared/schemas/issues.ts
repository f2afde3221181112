// A schema's verdict as the forms show it: one message per field. Pure: zod only.
import type { ZodType } from 'zod'

/**
 * `{ field: message }` for what a schema refuses in a value (the first message of each top-level
 * field, by the same names the server's 400 replies use); empty when the value passes.
 */
export function collectFieldIssues(schema: ZodType, value: unknown): Record<string, string> {
  const result = schema.safeParse(value)
  if (result.success) return {}
  const fields: Record<string, string> = {}
  for (const issue of result.error.issues) {
    const field = issue.path.length ? String(issue.path[0]) : 'body'
    fields[field] ??= issue.message
  }
  return fields
}
