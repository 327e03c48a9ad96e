import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import type { ErrorEnvelope, ErrorField } from '../../shared/api/error.js';
import { issuePath } from '../../shared/api/error.js';
import { logger } from '../logger.js';

/** The one application error: a code, an HTTP status, a message and how to fix it. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly options: { hint?: string; fields?: ErrorField[]; details?: unknown } = {},
  ) {
    super(message);
  }
}

export const badRequest = (message: string, hint?: string, fields: ErrorField[] = [], details?: unknown) =>
  new AppError(400, 'bad_request', message, { hint, fields, details });
export const notFound = (what: string) => new AppError(404, 'not_found', `${what} was not found`, { hint: 'check the address or go back to the list' });
export const forbidden = (message = 'your role does not allow this') => new AppError(403, 'forbidden', message, { hint: 'ask an administrator if you need this access' });
export const conflict = (message: string, details?: unknown, hint?: string) => new AppError(409, 'conflict', message, { details, hint });

export function fromZod(err: ZodError, where: string): AppError {
  const fields = err.issues.map((i) => ({ path: issuePath(i.path), message: i.message }));
  const first = fields[0];
  return new AppError(400, 'validation_failed', `the ${where} has ${fields.length} problem${fields.length === 1 ? '' : 's'}${first ? `: ${first.path || 'value'} ${first.message}` : ''}`, {
    hint: 'correct the fields listed and send again; nothing was saved',
    fields,
  });
}

function envelope(e: AppError): ErrorEnvelope {
  return { error: { code: e.code, message: e.message, hint: e.options.hint, fields: e.options.fields ?? [], details: e.options.details } };
}

/** 404 for unknown /api routes, in the same envelope. */
export const apiNotFound: RequestHandler = (req, res) => {
  res.status(404).json(envelope(new AppError(404, 'not_found', `no API route ${req.method} ${req.path}`, { hint: 'see the API summary in the README' })));
};

function isDatabaseDown(err: unknown): boolean {
  const e = err as { code?: string; message?: string };
  // On the Unix socket a stopped server is "connect ENOENT <socket>" (its socket file is gone).
  return ['ECONNREFUSED', 'ECONNRESET', '57P01', '57P03', 'ETIMEDOUT', '08006', '08001'].includes(String(e?.code ?? ''))
    || /Connection terminated|connect (ECONNREFUSED|ENOENT)|timeout exceeded when trying to connect|the database system is (shutting down|starting up)/i.test(String(e?.message ?? ''));
}

/** The final error handler: known errors keep their status, anything else is a logged 500. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  let e: AppError;
  if (err instanceof AppError) e = err;
  else if (err instanceof ZodError) e = fromZod(err, 'request');
  else if (err?.type === 'entity.parse.failed') e = new AppError(400, 'malformed_json', 'the request body is not valid JSON', { hint: 'send a JSON object with Content-Type: application/json' });
  else if (err?.type === 'entity.too.large') e = new AppError(413, 'too_large', 'the request body is too large', { hint: 'send less data at a time' });
  else if (err?.code === 'LIMIT_FILE_SIZE') e = new AppError(413, 'file_too_large', 'the uploaded file is larger than the limit', { hint: 'split the file or ask an administrator to raise the upload limit' });
  else if (err?.code === 'EBADCSRFTOKEN' || err?.code === 'EBADCSRF') e = new AppError(403, 'csrf_failed', 'the request was missing its security token', { hint: 'reload the page and try again' });
  else if (isDatabaseDown(err)) e = new AppError(503, 'database_unavailable', 'the database is not reachable at the moment', { hint: 'try again in a minute; nothing was saved' });
  else {
    logger.error({ err: { message: err?.message, stack: err?.stack, code: err?.code }, path: req.path }, 'unhandled error');
    e = new AppError(500, 'internal_error', 'something went wrong on the server', { hint: 'try again; if it keeps happening tell an administrator the time it happened' });
  }
  if (res.headersSent) return;
  res.status(e.status).json(envelope(e));
};
