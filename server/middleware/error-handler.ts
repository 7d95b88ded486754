import type { ErrorRequestHandler, RequestHandler } from 'express';
import { AppError } from '../lib/errors';

/** One place maps typed errors (and body-parser / multer failures) to `{ error: { code, message, fields? } }`. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  let status = 500;
  let body: { code: string; message: string; fields?: Record<string, string> } = {
    code: 'internal_error',
    message: 'Something went wrong on our side. Nothing was saved twice; try again.',
  };
  if (err instanceof AppError) {
    status = err.status;
    body = { code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) };
    if (err.headers) for (const [k, v] of Object.entries(err.headers)) res.setHeader(k, v);
  } else if (err && typeof err === 'object' && 'type' in err && typeof (err as { status?: unknown }).status === 'number') {
    // body-parser errors: entity.parse.failed, entity.too.large, encoding.unsupported, ...
    const e = err as { status: number; type: string };
    status = e.status >= 400 && e.status < 500 ? e.status : 400;
    const messages: Record<string, string> = {
      'entity.parse.failed': 'The request body is not valid JSON.',
      'entity.too.large': 'The request body is too large.',
      'encoding.unsupported': 'Unsupported body encoding.',
      'charset.unsupported': 'Unsupported charset.',
      'request.aborted': 'The request was aborted.',
    };
    body = { code: e.type.replace(/\./g, '_'), message: messages[e.type] ?? 'The request body could not be read.' };
  } else if (err && typeof err === 'object' && (err as { name?: string }).name === 'MulterError') {
    const e = err as { code: string; field?: string };
    const tooLarge = ['LIMIT_FILE_SIZE', 'LIMIT_FIELD_VALUE', 'LIMIT_PART_COUNT', 'LIMIT_FILE_COUNT', 'LIMIT_FIELD_COUNT'].includes(e.code);
    status = e.code === 'LIMIT_FILE_SIZE' ? 413 : tooLarge ? 413 : 400;
    body = { code: e.code.toLowerCase(), message: multerMessage(e.code) };
  } else if (err instanceof URIError) {
    status = 400;
    body = { code: 'bad_request', message: 'The address is malformed.' };
  } else if (err && typeof err === 'object' && typeof (err as { message?: unknown }).message === 'string' && /Multipart|Unexpected end of form|Malformed part header|boundary/i.test((err as Error).message)) {
    status = 400;
    body = { code: 'malformed_multipart', message: 'The upload is malformed.' };
  } else {
    req.log?.('error', err);
    if (!req.log) console.error(err);
  }
  if (res.headersSent) {
    res.end();
    return;
  }
  res.status(status).json({ error: body });
};

function multerMessage(code: string): string {
  switch (code) {
    case 'LIMIT_FILE_SIZE':
      return 'That file is larger than the limit.';
    case 'LIMIT_FILE_COUNT':
      return 'Too many files in one upload.';
    case 'LIMIT_UNEXPECTED_FILE':
      return 'Unexpected file field.';
    default:
      return 'The upload could not be read.';
  }
}

export const apiNotFound: RequestHandler = (_req, res) => {
  res.status(404).json({ error: { code: 'not_found', message: 'No such API route.' } });
};

declare module 'express-serve-static-core' {
  interface Request {
    log?: (level: 'error' | 'warn' | 'info', ...args: unknown[]) => void;
  }
}
