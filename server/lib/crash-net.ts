import { AsyncLocalStorage } from 'node:async_hooks';
import type { RequestHandler, Response } from 'express';

/**
 * The last line of defence for errors Express never sees: a throw in a timer or an event handler,
 * a promise nobody awaited. Each request runs inside its own async context, so the process-level
 * handlers can tell which request an escaped error belongs to and answer it, instead of the one
 * failure taking every other request down with the process.
 */
const requestContext = new AsyncLocalStorage<{ res: Response }>();

/** Mount first: everything after it (and every callback it schedules) runs in the request's context. */
export const crashNetMiddleware: RequestHandler = (_req, res, next) => {
  requestContext.run({ res }, next);
};

const INTERNAL = { error: { code: 'INTERNAL', message: 'Something went wrong on the server; the change was not saved' } };

/** Answers the request an escaped error belongs to, if any, and says what it did. */
export function answerEscapedError(): 'answered 500' | 'cut off' | 'already answered' | 'no request' {
  const res = requestContext.getStore()?.res;
  if (!res) return 'no request';
  if (!res.headersSent) {
    res.status(500).json(INTERNAL);
    return 'answered 500';
  }
  if (!res.writableEnded) {
    // Half a body is worse than none: cut it off so the client sees a failure, not a short answer.
    res.destroy();
    return 'cut off';
  }
  return 'already answered';
}

let installed: ((e: unknown) => void) | null = null;

/**
 * Process-level handlers: log, answer that request's 500 where it is still open, keep serving.
 * Errors from outside any request are logged too and the server keeps running; installing twice
 * is a no-op (tests and the entry point may both call it).
 */
export function installCrashNet(log: (msg: string, e: unknown) => void): void {
  if (installed) return;
  const handle = (kind: string) => (e: unknown) => {
    let outcome: string;
    try {
      outcome = answerEscapedError();
    } catch (answerError) {
      outcome = 'could not answer';
      log('crash net: could not answer the request', answerError);
    }
    log(outcome === 'no request' ? `${kind} outside any request (still serving)` : `${kind} in a request (${outcome}; still serving)`, e);
  };
  installed = handle('uncaught exception');
  process.on('uncaughtException', installed);
  process.on('unhandledRejection', handle('unhandled rejection'));
}
