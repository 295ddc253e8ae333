// Structured JSON logs (pino); one request id per request, echoed in errors and the X-Request-Id header.
import { randomUUID } from 'node:crypto';
import pino, { type Logger } from 'pino';
import { pinoHttp } from 'pino-http';

/**
 * Errors as pino writes them, without the database client some driver errors carry (`err.client`:
 * its whole connection state, type tables and buffers, kilobytes per line and nothing to read).
 */
function errSerializer(err: unknown) {
  const out = pino.stdSerializers.err(err as Error) as unknown as Record<string, unknown>;
  if (out && typeof out === 'object') delete out.client;
  return out;
}

export function createLogger(level: string): Logger {
  return pino({ level, redact: ['req.headers.cookie', 'req.headers.authorization', 'res.headers["set-cookie"]'], serializers: { err: errSerializer } });
}

export function httpLogger(logger: Logger) {
  return pinoHttp({
    logger,
    genReqId: (req, res) => {
      const incoming = req.headers['x-request-id'];
      const id = typeof incoming === 'string' && /^[\w-]{8,64}$/.test(incoming) ? incoming : randomUUID();
      res.setHeader('X-Request-Id', id);
      return id;
    },
    autoLogging: { ignore: (req) => !req.url?.startsWith('/api/') },
    customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'info' : 'info'),
    serializers: {
      req: (req) => ({ id: req.id, method: req.method, url: req.url }),
      res: (res) => ({ statusCode: res.statusCode }),
    },
  });
}
