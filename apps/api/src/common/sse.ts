import type { Request, Response } from 'express';

export const SSE_HEARTBEAT_MS = 15000;

/**
 * Writes an async sequence as a text/event-stream: headers flushed at once, `data: <json>` per item,
 * a comment line every 15 s so proxies keep the connection, the response ended after the last item.
 * The abort signal given to `source` fires when the client goes away.
 */
export async function streamSse<T>(req: Request, res: Response, source: (signal: AbortSignal) => AsyncIterable<T>): Promise<void> {
  const abort = new AbortController();
  res.status(200);
  res.setHeader('Content-Type', 'text/event-stream; charset=utf-8');
  res.setHeader('Cache-Control', 'no-cache, no-transform');
  res.setHeader('Connection', 'keep-alive');
  res.setHeader('X-Accel-Buffering', 'no');
  res.flushHeaders();
  res.write(': stream open\n\n');
  const heartbeat = setInterval(() => res.write(': heartbeat\n\n'), SSE_HEARTBEAT_MS);
  const onClose = () => abort.abort();
  req.on('close', onClose);
  try {
    for await (const item of source(abort.signal)) {
      if (abort.signal.aborted) break;
      res.write(`data: ${JSON.stringify(item)}\n\n`);
    }
  } catch (err) {
    if (!abort.signal.aborted) res.write(`event: error\ndata: ${JSON.stringify({ message: (err as Error).message })}\n\n`);
  } finally {
    clearInterval(heartbeat);
    req.off('close', onClose);
    res.end();
  }
}
