// One error type and one error path for the whole API.
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import { BaseError as SequelizeBaseError, ConnectionError } from 'sequelize';
import type { ApiErrorBody } from '@shared/types';
import { fieldErrors } from '@shared/validation';

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

export function errorHandler(options: { isProduction: boolean }): ErrorRequestHandler {
  return (err: unknown, _req, res, next) => {
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
    if (err instanceof ConnectionError) {
      return body(503, 'database_unavailable', 'The database is not reachable right now. Try again in a moment.');
    }
    const http = err as HttpLikeError;
    const status = http?.status ?? http?.statusCode;
    if (typeof status === 'number' && status >= 400 && status < 500) {
      if (http.type === 'entity.parse.failed') return body(400, 'bad_json', 'The request body is not valid JSON.');
      if (http.type === 'entity.too.large') return body(413, 'too_large', 'The request body is too large.');
      return body(status, http.code?.toLowerCase() ?? 'bad_request', http.message ?? 'The request was refused.');
    }

    if (!(err instanceof SequelizeBaseError) || !options.isProduction) console.error(err);
    else console.error('database error:', (err as Error).message);
    const message = options.isProduction
      ? 'Something went wrong on our side. Try again; if it keeps happening, tell an admin.'
      : `Internal error: ${(err as Error)?.message ?? String(err)}`;
    return body(500, 'internal', message);
  };
}
