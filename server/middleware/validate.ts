import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { AppError } from '../errors';

type Part = 'body' | 'query' | 'params';

/**
 * Validates one part of the request against a shared schema and stores the parsed value in
 * `res.locals[part]`, so handlers read typed, normalised input.
 */
export function validate<S extends z.ZodType>(part: Part, schema: S): RequestHandler {
  return (req, res, next) => {
    const result = schema.safeParse(req[part] ?? {});
    if (!result.success) return next(AppError.validation(result.error));
    res.locals[part] = result.data;
    next();
  };
}

export function parsed<S extends z.ZodType>(res: { locals: Record<string, unknown> }, part: Part, _schema: S) {
  return res.locals[part] as z.output<S>;
}
