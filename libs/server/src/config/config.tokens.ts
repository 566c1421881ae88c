/** Injection token for the validated AppConfig (see config.ts). */
export const APP_CONFIG = Symbol('APP_CONFIG');

/** Injection token for the validated WorkerConfig (the worker's processes). */
export const WORKER_CONFIG = Symbol('WORKER_CONFIG');
