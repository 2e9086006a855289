import pino, { type Logger } from 'pino';

// No 'server-only' marker: the background worker (a plain Node process) logs through this too.

declare global {
  var __tallyvatLog: Logger | undefined;
}

/**
 * The one logger of this process: JSON lines on stdout (one object per event, ISO time), at the
 * level LOG_LEVEL names (default info; the tests run the server at warn). Kept on globalThis
 * because Next bundles route handlers and pages apart, each with its own copy of this module.
 */
export const log: Logger =
  globalThis.__tallyvatLog ??
  (globalThis.__tallyvatLog = pino(
    {
      level: process.env.LOG_LEVEL ?? 'info',
      base: { pid: process.pid, service: process.env.TALLYVAT_SERVICE ?? 'web' },
      timestamp: pino.stdTimeFunctions.isoTime,
      formatters: { level: (label) => ({ level: label }) },
    },
    // Written asynchronously: lines that come in the same moment share one write to stdout (a
    // write per request line was a measurable share of a request's CPU). pino flushes what is
    // pending when the process exits.
    pino.destination({ dest: 1, sync: false }),
  ));
