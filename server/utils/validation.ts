import type { H3Event } from 'h3'
import type { z } from 'zod'

export interface FieldProblem { field: string, reason: string }

/** Turns zod issues into "field: reason" problems; unknown keys name each key. */
export function problemsOf(error: z.ZodError): FieldProblem[] {
  return error.issues.flatMap((issue) => {
    const base = issue.path.map(String).join('.')
    if (issue.code === 'unrecognized_keys') {
      return issue.keys.map(key => ({ field: base ? `${base}.${key}` : key, reason: 'is not a known field' }))
    }
    return [{ field: base || '(body)', reason: issue.message }]
  })
}

/** The one shape of a 400: the first problem in the message, all of them in data. */
export function badRequest(problems: FieldProblem[]) {
  const first = problems[0] ?? { field: '(body)', reason: 'is not valid' }
  return createError({
    statusCode: 400,
    statusMessage: 'Bad Request',
    message: `${first.field}: ${first.reason}`,
    data: { field: first.field, reason: first.reason, problems },
  })
}

function check<S extends z.ZodType>(schema: S, input: unknown): z.output<S> {
  const result = schema.safeParse(input)
  if (!result.success) throw badRequest(problemsOf(result.error))
  return result.data
}

/**
 * Reads and validates a JSON body; malformed JSON and schema failures are 400s naming the field.
 * `accept` is an optional fast path for a hot route: it returns the parsed body when it is plainly
 * valid (exactly what the schema would return) or undefined, and then the schema decides and words
 * the problems. With it the body is read raw and parsed with JSON.parse, skipping h3's safe-parse.
 */
export async function readBodyAs<S extends z.ZodType>(event: H3Event, schema: S, accept?: (body: unknown) => z.output<S> | undefined): Promise<z.output<S>> {
  let body: unknown
  try {
    if (accept) {
      const raw = await readRawBody(event, 'utf8')
      body = raw ? JSON.parse(raw) : undefined
    }
    else {
      body = await readBody(event)
    }
  }
  catch {
    throw badRequest([{ field: '(body)', reason: 'is not valid JSON' }])
  }
  body ??= {}
  return accept?.(body) ?? check(schema, body)
}

export function paramsAs<S extends z.ZodType>(event: H3Event, schema: S): z.output<S> {
  return check(schema, getRouterParams(event))
}

export function queryAs<S extends z.ZodType>(event: H3Event, schema: S): z.output<S> {
  return check(schema, getQuery(event))
}
