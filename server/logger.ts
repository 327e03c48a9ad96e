import pino from 'pino';

/**
 * One logger. Identifiers typed by abstractors never reach it (the keyed hash is computed
 * before logging); request bodies are never logged.
 */
const level = process.env.LOG_LEVEL ?? (process.env.NODE_ENV === 'test' ? 'warn' : 'info');
export const logger = process.env.LOG_FILE
  ? pino({ level }, pino.destination({ dest: process.env.LOG_FILE, sync: false, mkdir: true }))
  : pino({ level });
