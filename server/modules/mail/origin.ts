// Where links in messages point: PUBLIC_ORIGIN when configured, else the origin of the request
// that caused the message, which routes pass to the service that writes the message.
import type { Request } from 'express';

export function originOf(req: Request): string {
  return `${req.protocol}://${req.get('host') ?? 'localhost'}`;
}

export function linkOrigin(config: { PUBLIC_ORIGIN?: string; PORT: number }, requestOrigin?: string): string {
  if (config.PUBLIC_ORIGIN) return new URL(config.PUBLIC_ORIGIN).origin;
  return requestOrigin ?? `http://localhost:${config.PORT}`;
}
