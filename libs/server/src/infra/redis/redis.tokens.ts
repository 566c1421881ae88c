/** Injection token of the api's shared ioredis client. */
export const REDIS_CLIENT = Symbol('REDIS_CLIENT');
