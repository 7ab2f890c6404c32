import { pino, type Logger } from 'pino';

export type { Logger };

export function createLogger(options: { level: string; name: string }): Logger {
  return pino({
    name: options.name,
    level: options.level,
    redact: { paths: ['req.headers.cookie', 'req.headers.authorization', 'password', '*.password', 'secret'], remove: true },
  });
}
