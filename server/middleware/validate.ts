import type { Request, RequestHandler, Response } from 'express';
import type { z } from 'zod';
import { AppError } from '../errors';

/** The schemas of a route's input, from `shared/schemas`. */
export interface Schemas {
  params?: z.ZodType;
  query?: z.ZodType;
  body?: z.ZodType;
}

/** What a route reads once its schemas passed: the parsed (normalised) value of each part named. */
export type Input<S extends Schemas> = { [K in keyof S]: S[K] extends z.ZodType ? z.output<S[K]> : never };

/** A middleware that validates, and reads back what it validated with the schemas' types. */
export interface Validator<S extends Schemas> extends RequestHandler {
  input(res: Response): Input<S>;
}

const PARTS = ['params', 'query', 'body'] as const;
const STORED = 'validated';

/** Parses a value with a shared schema; failures are a 422 with a message per field. */
export function parse<S extends z.ZodType>(schema: S, value: unknown): z.output<S> {
  const result = schema.safeParse(value);
  if (!result.success) throw AppError.validation(result.error);
  return result.data;
}

function stored(res: Response): Record<string, unknown> {
  return (res.locals[STORED] ??= {}) as Record<string, unknown>;
}

/**
 * Validates the parts of the request named (params, then query, then body) against their schemas
 * and keeps the parsed values for `input(res)`. Use it where the value is needed before the handler
 * (a rate limit keyed by the address); otherwise `handler` is shorter.
 */
export function validate<S extends Schemas>(schemas: S): Validator<S> {
  const middleware: RequestHandler = (req, res, next) => {
    const values = stored(res);
    for (const part of PARTS) {
      const schema = schemas[part];
      if (schema) values[part] = parse(schema, req[part] ?? {});
    }
    next();
  };
  return Object.assign(middleware, {
    // the one place where the stored values meet their types: `middleware` wrote them from these schemas
    input: (res: Response) => stored(res) as Input<S>,
  });
}

/** The body as validated so far, for helpers shared by routes of different schemas (rate-limit keys). */
export function validatedBody(res: Response): unknown {
  return stored(res).body;
}

/**
 * A route handler that gets its validated input first: `handler({ params, body }, async ({ params, body }, req, res) => …)`.
 * `fields` replaces `req.body` as what the body schema reads (the fields of a multipart form).
 */
export function handler<S extends Schemas>(
  schemas: S & { fields?: (req: Request) => unknown },
  fn: (input: Input<S>, req: Request, res: Response) => unknown,
): (req: Request, res: Response) => Promise<void> {
  return async (req, res) => {
    const values = stored(res);
    for (const part of PARTS) {
      const schema = schemas[part];
      if (!schema) continue;
      const raw = part === 'body' && schemas.fields ? schemas.fields(req) : req[part];
      values[part] = parse(schema, raw ?? {});
    }
    await fn(values as Input<S>, req, res);
  };
}
