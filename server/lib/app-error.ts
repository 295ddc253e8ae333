// The one error class the API throws on purpose; anything else reaching the handler is a bug.
import { ERROR_CODES, type ErrorCode } from '../../src/shared/errors';

export class AppError extends Error {
  readonly status: number;
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly fields?: Record<string, string>,
    /** Extra data a client needs to recover, e.g. the current text on an edit conflict. */
    readonly details?: Record<string, unknown>,
  ) {
    super(message);
    this.status = ERROR_CODES[code];
  }

  static invalid(message: string, fields?: Record<string, string>) {
    return new AppError('invalid_input', message, fields);
  }
  static notFound(what = 'This item') {
    return new AppError('not_found', `${what} was not found`);
  }
  static forbidden(message = 'Your roles do not allow this') {
    return new AppError('forbidden', message);
  }
  static unauthenticated(message = 'Please sign in') {
    return new AppError('unauthenticated', message);
  }
  static conflict(message: string, fields?: Record<string, string>) {
    return new AppError('conflict', message, fields);
  }
}
