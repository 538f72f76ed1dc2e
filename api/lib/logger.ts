import { pino, type Logger } from 'pino';

export function createLogger(level = process.env.LOG_LEVEL ?? (process.env.NODE_ENV === 'test' ? 'silent' : 'info')): Logger {
  return pino({ level, redact: ['req.headers.cookie', 'req.headers.authorization'] });
}
