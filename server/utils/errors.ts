import { createError, getQuery, getRouterParams, readBody } from 'h3'
import type { ZodType } from 'zod'

export interface FieldIssue { field: string, message: string }

/**
 * The one 400 for one bad field: `Invalid <field>: <message>`, with `issues: [{ field, message }]` in
 * its data (beside any extra `data`, e.g. an import's row-by-row preview). `title` replaces the
 * message line when it reads better on its own (an import's summary).
 */
export function fieldError(field: string, message: string, options: { data?: Record<string, unknown>, title?: string } = {}) {
  return createError({
    statusCode: 400,
    statusMessage: 'Bad Request',
    message: options.title ?? `Invalid ${field}: ${message}`,
    data: { ...options.data, issues: [{ field, message }] }
  })
}

/** Turns zod issues into a 400 whose message names the first offending field. */
export function invalidInput(issues: FieldIssue[], where = 'input') {
  const first = issues[0]
  const message = first ? `Invalid ${first.field}: ${first.message}` : `Invalid ${where}`
  return createError({ statusCode: 400, statusMessage: 'Bad Request', message, data: { issues } })
}

/** Validates data against a schema, throwing a 400 that names the field. */
export function parseInput<T>(schema: ZodType<T>, data: unknown, where = 'input'): T {
  const result = schema.safeParse(data)
  if (result.success) return result.data
  throw invalidInput(result.error.issues.map(issue => ({
    field: issue.path.length ? issue.path.join('.') : where,
    message: issue.message
  })), where)
}

/** Reads and validates a JSON body; a body that is not JSON is a 400 too. */
export async function readBodyAs<T>(event: Parameters<typeof readBody>[0], schema: ZodType<T>): Promise<T> {
  let body: unknown
  try {
    body = await readBody(event)
  } catch {
    throw fieldError('body', 'not valid JSON', { title: 'The request body is not valid JSON' })
  }
  return parseInput(schema, body ?? {}, 'body')
}

/** Validates the query string. */
export function readQueryAs<T>(event: Parameters<typeof getQuery>[0], schema: ZodType<T>): T {
  return parseInput(schema, getQuery(event), 'query')
}

/** Validates route params. */
export function readParamsAs<T>(event: Parameters<typeof getRouterParams>[0], schema: ZodType<T>): T {
  return parseInput(schema, getRouterParams(event), 'params')
}

/** A 404 for a named kind of record. */
export function notFound(what: string) {
  return createError({ statusCode: 404, statusMessage: 'Not Found', message: `${what} not found` })
}

/** A 409 when a stale copy is saved over a newer one. */
export function conflict(message: string, data?: Record<string, unknown>) {
  return createError({ statusCode: 409, statusMessage: 'Conflict', message, data })
}
