// Plain, concise log lines on stdout: `HH:MM:SS.mmm [probe-key] message`. The simulator is a
// developer tool, not server code, so it does not use pino.
export type LogLevel = 'quiet' | 'info' | 'debug';

export interface Logger {
  info(message: string): void;
  warn(message: string): void;
  error(message: string): void;
  debug(message: string): void;
  child(prefix: string): Logger;
}

export function createLogger({
  level = 'info',
  write = (line: string) => process.stdout.write(`${line}\n`),
  prefix = '',
  now = () => new Date(),
}: {
  level?: LogLevel;
  write?: (line: string) => void;
  prefix?: string;
  now?: () => Date;
} = {}): Logger {
  const line = (tag: string, message: string): void => {
    const time = now().toISOString().slice(11, 23);
    write(`${time} ${tag}${prefix ? `[${prefix}] ` : ''}${message}`);
  };
  return {
    info: (m) => level !== 'quiet' && line('', m),
    warn: (m) => line('warn ', m),
    error: (m) => line('error ', m),
    debug: (m) => level === 'debug' && line('', m),
    child: (p) => createLogger({ level, write, prefix: prefix ? `${prefix} ${p}` : p, now }),
  };
}
