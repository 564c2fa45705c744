import type { z } from 'zod';
import { badRequest } from './errors';

/** Field path → first message, e.g. { "email": "Enter a valid e-mail address", "hydroUnits.2": "…" }. */
export function fieldErrors(error: z.ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join('.') : '_';
    if (!(key in fields)) fields[key] = issue.message;
  }
  return fields;
}

/** Parse or throw a 400 that names every bad field. */
export function parseOrThrow<S extends z.ZodType>(schema: S, value: unknown, what: string): z.output<S> {
  const result = schema.safeParse(value ?? {});
  if (result.success) return result.data;
  const fields = fieldErrors(result.error);
  const first = Object.entries(fields)[0];
  const summary = first ? (first[0] === '_' ? first[1] : `${first[0]}: ${first[1]}`) : 'invalid';
  throw badRequest(`The ${what} is invalid — ${summary}`, fields);
}
