// One error type and one error path for the whole API.
import { randomBytes } from 'node:crypto';
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import { BaseError as SequelizeBaseError, ConnectionError } from 'sequelize';
import type { ApiErrorBody } from '@shared/types';
import { fieldErrors } from '@shared/validation';
import { isDatabaseUnavailable, isRetriableTransactionError } from './db/errors';

export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
  ) {
    super(message);
    this.name = 'AppError';
  }

  static badRequest(message: string, fields?: Record<string, string>) {
    return new AppError(400, 'bad_request', message, fields);
  }
  static unauthorized(message = 'Sign in to do that.') {
    return new AppError(401, 'unauthorized', message);
  }
  static forbidden(message = 'Your account is not allowed to do that.') {
    return new AppError(403, 'forbidden', message);
  }
  static notFound(message = 'Nothing was found at that address.') {
    return new AppError(404, 'not_found', message);
  }
  static conflict(message: string) {
    return new AppError(409, 'conflict', message);
  }
  /** A 422 about one field; `summary` is the message above the form when it differs from the field's own. */
  static field(name: string, message: string, summary = message) {
    return new AppError(422, 'validation_failed', summary, { [name]: message });
  }
  /** A 422 about several fields at once. */
  static fields(message: string, fields: Record<string, string>) {
    return new AppError(422, 'validation_failed', message, fields);
  }
  static validation(error: ZodError, message = 'Some fields need another look.') {
    return new AppError(422, 'validation_failed', message, fieldErrors(error));
  }
}

export function apiNotFound(): RequestHandler {
  return (req, _res, next) => next(AppError.notFound(`There is no API endpoint ${req.method} ${req.originalUrl.split('?')[0]}.`));
}

interface HttpLikeError {
  status?: number;
  statusCode?: number;
  code?: string;
  type?: string;
  expose?: boolean;
  message?: string;
}

/** A short reference a person can quote, and an admin can find in the log. */
export function errorRef(): string {
  return randomBytes(4).toString('hex');
}

/**
 * Answers every error; internals (SQL, stacks) stay in the log in every mode, never in the answer.
 * `onDatabaseUnavailable` hears of each request that failed because the database did not answer.
 */
export function errorHandler(options: { onDatabaseUnavailable?: () => void } = {}): ErrorRequestHandler {
  return (err: unknown, req, res, next) => {
    if (res.headersSent) return next(err);
    const body = (status: number, code: string, message: string, fields?: Record<string, string>) => {
      const payload: ApiErrorBody = { error: { code, message, ...(fields ? { fields } : {}) } };
      res.status(status).json(payload);
    };

    if (err instanceof AppError) return body(err.status, err.code, err.message, err.fields);
    if (err instanceof ZodError) {
      const e = AppError.validation(err);
      return body(e.status, e.code, e.message, e.fields);
    }
    if (err instanceof ConnectionError || isDatabaseUnavailable(err)) {
      options.onDatabaseUnavailable?.();
      return body(503, 'database_unavailable', 'The database is not reachable right now. Try again in a moment.');
    }
    if (isRetriableTransactionError(err)) {
      // still losing lock conflicts after the retries in transact(): the shelf is very busy
      return body(503, 'database_busy', 'The shelf is very busy right now and your change was not saved. Try again in a moment.');
    }
    const http = err as HttpLikeError;
    const status = http?.status ?? http?.statusCode;
    if (typeof status === 'number' && status >= 400 && status < 500) {
      if (http.type === 'entity.parse.failed') return body(400, 'bad_json', 'The request body is not valid JSON.');
      if (http.type === 'entity.too.large') return body(413, 'too_large', 'The request body is too large.');
      return body(status, http.code?.toLowerCase() ?? 'bad_request', http.message ?? 'The request was refused.');
    }

    // the details (SQL included) go to the log only, under a reference the person can quote
    const ref = errorRef();
    const kind = err instanceof SequelizeBaseError ? 'database error' : 'error';
    console.error(`rigshelf: ${kind} ref ${ref} on ${req.method} ${req.originalUrl.split('?')[0]}:`, err);
    return body(500, 'internal', `Something went wrong on our side. Try again; if it keeps happening, tell an admin and quote ref ${ref}.`);
  };
}
