/**
 * @psiform/server: the server core shared by apps/api and apps/worker (no app imports another app).
 * Entities, migrations (run by the api's `db/migrate`), stores (the only code touching TypeORM), adapters for
 * PostgreSQL, S3, Redis, SMTP and BullMQ, the validated configuration, storage keys, job routing and the engine
 * version. Each feature's persistence lives in its own folder (`figures/`, `jobs/`, ...), as in the api.
 */
export * from './assets/asset-store';
export * from './assets/asset.entity';
export * from './audit/audit-entry.entity';
export * from './audit/audit.repository';
export * from './config/config.module';
export * from './config/config.tokens';
export * from './config/config';
export * from './db/run-migrations';
export * from './db/schema';
export * from './delivery-profiles/delivery-profile.entity';
export * from './delivery-profiles/delivery-profiles.repository';
export * from './exports/figure-set.entity';
export * from './exports/figure-sets.repository';
export * from './figures/figure-version.entity';
export * from './figures/figure.entity';
export * from './figures/figures.repository';
export * from './figures/recipe-hash';
export * from './health/health.probe';
export * from './infra/database/database-health';
export * from './infra/mail/mail-health';
export * from './infra/mail/mail.module';
export * from './infra/mail/mailer';
export * from './infra/mail/smtp-mailer';
export * from './infra/queue/bull-job-queue';
export * from './infra/queue/job-queue';
export * from './infra/queue/queue.module';
export * from './infra/redis/attempt-gate';
export * from './infra/redis/redis-attempt-gate';
export * from './infra/redis/redis-health';
export * from './infra/redis/redis.module';
export * from './infra/redis/redis.tokens';
export * from './infra/redis/request-redis';
export * from './infra/storage/object-storage';
export * from './infra/storage/s3-object-storage';
export * from './infra/storage/storage-health';
export * from './infra/storage/storage.module';
export * from './jobs/job.entity';
export * from './jobs/jobs.repository';
export * from './pipeline/assets-dir';
export * from './pipeline/engine';
export * from './pipeline/mesh-job';
export * from './pipeline/storage-keys';
export * from './publications/membership.entity';
export * from './publications/publication.entity';
export * from './publications/publications.repository';
export * from './reviews/comment.entity';
export * from './reviews/review-round.entity';
export * from './reviews/review-transitions';
export * from './reviews/reviews.repository';
export * from './swatchbooks/batch.entity';
export * from './swatchbooks/house-style.entity';
export * from './swatchbooks/swatchbook.entity';
export * from './swatchbooks/swatchbooks.repository';
export * from './uploads/cube-check';
export * from './users/user.entity';
export * from './users/users.repository';
export * from './users/user-link.entity';
