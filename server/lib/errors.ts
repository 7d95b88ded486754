/** Typed errors thrown by services; the error middleware maps them to the JSON error shape. */
export class AppError extends Error {
  constructor(
    public readonly status: number,
    public readonly code: string,
    message: string,
    public readonly fields?: Record<string, string>,
    public readonly headers?: Record<string, string>,
  ) {
    super(message);
    this.name = new.target.name;
  }
}

export class ValidationError extends AppError {
  constructor(message = 'Some fields need attention.', fields?: Record<string, string>) {
    super(400, 'validation_failed', message, fields);
  }
}
export class UnauthenticatedError extends AppError {
  constructor(message = 'Please sign in.') {
    super(401, 'unauthenticated', message);
  }
}
export class ForbiddenError extends AppError {
  constructor(message = 'You are not allowed to do that.') {
    super(403, 'forbidden', message);
  }
}
export class NotFoundError extends AppError {
  constructor(message = 'Not found.') {
    super(404, 'not_found', message);
  }
}
export class ConflictError extends AppError {
  constructor(message = 'This record changed or cannot make that move now.', code = 'conflict') {
    super(409, code, message);
  }
}
export class PayloadTooLargeError extends AppError {
  constructor(message = 'Too large.') {
    super(413, 'too_large', message);
  }
}
export class UnsupportedMediaTypeError extends AppError {
  constructor(message = 'Unsupported file type.') {
    super(415, 'unsupported_type', message);
  }
}
export class TooManyRequestsError extends AppError {
  constructor(retryAfterSeconds: number, message = 'Too many attempts. Try again later.') {
    super(429, 'too_many_requests', message, undefined, { 'Retry-After': String(retryAfterSeconds) });
  }
}
