import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { validationError } from './errors';

/** zod schemas for the parts of a request; each part that has one is parsed. */
export interface RequestSchemas {
  body?: z.ZodType;
  query?: z.ZodType;
  params?: z.ZodType;
}

export interface ParsedInput {
  body: unknown;
  query: unknown;
  params: unknown;
}

const PARTS = ['params', 'query', 'body'] as const;

/** The first zod issue as the API's 400: field is the issue's path ("email", "filters.custodian"). */
export function firstIssueError(part: (typeof PARTS)[number], error: z.ZodError) {
  const issue = error.issues[0];
  const field = issue.path.length > 0 ? issue.path.map(String).join('.') : part;
  return validationError(field, issue.message);
}

/**
 * Parses body, query and params with the given schemas. The first issue becomes
 * 400 `{"error":{"code":"validation_failed","message":"<field>: <message>","field":"<field>"}}`.
 * Parsed values are kept in res.locals.input (Express 5's req.query is read-only);
 * route() hands them to the handler typed.
 */
export function validate(schemas: RequestSchemas = {}): RequestHandler {
  return (req, res, next) => {
    const input: ParsedInput = { body: req.body, query: req.query, params: req.params };
    for (const part of PARTS) {
      const schema = schemas[part];
      if (!schema) continue;
      // An absent JSON body is checked as {} so "missing field" names the field.
      const raw = part === 'body' ? (req.body ?? {}) : input[part];
      const result = schema.safeParse(raw);
      if (!result.success) return next(firstIssueError(part, result.error));
      input[part] = result.data;
    }
    res.locals.input = input;
    next();
  };
}
