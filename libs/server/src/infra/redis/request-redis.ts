import type { RedisOptions } from 'ioredis';

/** How long a Redis command in a request path may take before it fails (the caller answers 503 with the reason). */
export const REDIS_COMMAND_TIMEOUT_MS = 1000;

/**
 * Options of every Redis connection the API uses while answering a request (its shared client, queue producers).
 * - maxRetriesPerRequest 1, connectTimeout 2 s: Redis DOWN (refused, unreachable) fails a command quickly instead of
 *   queueing it while ioredis reconnects.
 * - commandTimeout: Redis STALLED (connected but not answering, e.g. paused or swapping) fails a command after 1 s (the request still has to write its answer within 2 s);
 *   without it the command waits as long as the stall lasts (15-19 s seen in mesh requests). Only for connections
 *   without blocking commands: BullMQ Workers and QueueEvents must not use these options.
 */
export function requestRedisOptions(): RedisOptions {
  return { maxRetriesPerRequest: 1, connectTimeout: 2000, commandTimeout: REDIS_COMMAND_TIMEOUT_MS, retryStrategy: (times) => Math.min(times * 200, 2000) };
}
