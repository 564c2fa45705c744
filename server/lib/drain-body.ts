import type { Request, Response } from 'express';

/** A body no route reads is read and dropped up to this size before the answer goes out. */
export const DRAIN_LIMIT_BYTES = 1024 * 1024;

const nothingLeft = (req: Request) => req.readableEnded || (req.complete && req.readableLength === 0);

/**
 * Read and drop what is left of a request body (a body sent to a route that takes none, or of a
 * type it does not read, or to a request refused before it was read). Answering while the client is
 * still sending makes Node close the connection with the body unread, and the client then sees a
 * reset instead of the answer. Past `limit` bytes it stops and resolves false: the answer then goes
 * out with Connection: close (an unauthorised 100 MB upload is not read to its end).
 */
export function drainBody(req: Request, limit = DRAIN_LIMIT_BYTES): Promise<boolean> {
  if (nothingLeft(req)) return Promise.resolve(true);
  return new Promise((resolve) => {
    let seen = 0;
    const done = (ok: boolean) => {
      req.off('data', onData);
      req.off('end', onEnd);
      req.off('error', onEnd);
      req.off('close', onEnd);
      if (!ok) req.pause();
      resolve(ok);
    };
    const onData = (chunk: Buffer) => {
      seen += chunk.length;
      if (seen > limit) done(false);
    };
    const onEnd = () => done(true);
    req.on('data', onData);
    req.once('end', onEnd);
    req.once('error', onEnd);
    req.once('close', onEnd);
    req.resume();
  });
}

/** Before an answer: drop the unread body, or say the connection will close. */
export async function settleBody(req: Request, res: Response): Promise<void> {
  if (!(await drainBody(req)) && !res.headersSent) res.setHeader('Connection', 'close');
}
