export const WORKER_CONFIG = Symbol('WORKER_CONFIG');
