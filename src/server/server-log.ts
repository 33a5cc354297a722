import type { LogLevel } from './settings.ts';
import { logLevels } from './settings.ts';

/**
 * The server's only logger. It takes plain strings built from fixed words, methods, route patterns,
 * statuses and error names, never request bodies or records, so no patient data reaches a log line.
 */
export interface ServerLog {
  error(message: string): void;
  warn(message: string): void;
  info(message: string): void;
  debug(message: string): void;
}

/** A logger printing at and above `level` through `write` (stderr by default). */
export function createServerLog(level: LogLevel, write: (line: string) => void = (line) => process.stderr.write(`${line}\n`)): ServerLog {
  const rank = logLevels.indexOf(level);
  const at = (name: Exclude<LogLevel, 'silent'>) => (message: string) => {
    if (logLevels.indexOf(name) <= rank) write(`${new Date().toISOString()} ${name} ${message}`);
  };
  return { error: at('error'), warn: at('warn'), info: at('info'), debug: at('debug') };
}
