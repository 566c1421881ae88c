import { Inject, Injectable } from '@nestjs/common';
import type Redis from 'ioredis';
import { REDIS_CLIENT } from './redis.tokens';
import { AttemptGate, type BackoffPolicy, type GateVerdict } from './attempt-gate';

const PREFIX = 'psiform:attempts:';

/**
 * One hash per key {n: counted attempts, next: epoch ms before which attempts are refused}, read and written by one
 * Lua script, which Redis runs atomically: the check and the count cannot interleave with another request's. The
 * clock is Redis's own (TIME), so several API processes agree on it. Same rule as backoffDelayMs in attempt-gate.ts.
 */
const ACQUIRE = `
local t = redis.call('TIME')
local now = tonumber(t[1]) * 1000 + math.floor(tonumber(t[2]) / 1000)
local nextAt = tonumber(redis.call('HGET', KEYS[1], 'next') or '0')
if now < nextAt then
  return {0, tonumber(redis.call('HGET', KEYS[1], 'n') or '0'), nextAt - now}
end
local n = redis.call('HINCRBY', KEYS[1], 'n', 1)
local free, base, max, memory = tonumber(ARGV[1]), tonumber(ARGV[2]), tonumber(ARGV[3]), tonumber(ARGV[4])
local delay = 0
if n >= free then delay = math.min(max, base * 2 ^ (n - free)) end
redis.call('HSET', KEYS[1], 'next', now + delay)
redis.call('PEXPIRE', KEYS[1], memory + delay)
return {1, n, delay}
`;

const REFUND = `
local n = tonumber(redis.call('HGET', KEYS[1], 'n') or '0')
if n > 0 then redis.call('HINCRBY', KEYS[1], 'n', -1) end
return n
`;

@Injectable()
export class RedisAttemptGate extends AttemptGate {
  constructor(@Inject(REDIS_CLIENT) private readonly redis: Redis) {
    super();
  }

  async acquire(key: string, p: BackoffPolicy): Promise<GateVerdict> {
    const [allowed, attempts, waitMs] = (await this.redis.eval(ACQUIRE, 1, PREFIX + key, p.freeAttempts, p.baseDelayMs, p.maxDelayMs, p.memoryMs)) as [number, number, number];
    return { allowed: allowed === 1, attempts, waitMs };
  }

  async refund(key: string): Promise<void> {
    await this.redis.eval(REFUND, 1, PREFIX + key);
  }

  async clear(key: string): Promise<void> {
    await this.redis.del(PREFIX + key);
  }
}
