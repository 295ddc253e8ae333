// The API's error shape and codes, shared by the server (which builds it) and the client (which reads it).

export const ERROR_CODES = {
  invalid_input: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  payload_too_large: 413,
  unsupported_media_type: 415,
  rate_limited: 429,
  internal: 500,
  unavailable: 503,
  insufficient_storage: 507,
} as const;

export type ErrorCode = keyof typeof ERROR_CODES;

export interface ApiErrorBody {
  error: {
    code: ErrorCode;
    message: string;
    fields?: Record<string, string>;
    details?: Record<string, unknown>;
    requestId?: string;
  };
}
