/** Injection token for the validated AppConfig (see config.ts). */
export const APP_CONFIG = Symbol('APP_CONFIG');
