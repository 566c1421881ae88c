import type { DataSourceOptions } from 'typeorm';
import { UserEntity } from '../users/user.entity';
import { PublicationEntity } from '../publications/publication.entity';
import { MembershipEntity } from '../publications/membership.entity';
import { FigureEntity } from '../figures/figure.entity';
import { FigureVersionEntity } from '../figures/figure-version.entity';
import { AssetEntity } from '../assets/asset.entity';
import { JobEntity } from '../jobs/job.entity';
import { Foundation1764633600000 } from './migrations/1764633600000-Foundation';
import { FigureJobs1764720000000 } from './migrations/1764720000000-FigureJobs';
import { SwatchbookEntity, SwatchbookVersionEntity } from '../swatchbooks/swatchbook.entity';
import { HouseStyleEntity } from '../swatchbooks/house-style.entity';
import { BatchEntity, BatchItemEntity } from '../swatchbooks/batch.entity';
import { ReviewRoundEntity } from '../reviews/review-round.entity';
import { CommentEntity } from '../reviews/comment.entity';
import { AuditEntryEntity } from '../audit/audit-entry.entity';
import { EditorialReview1764806400000 } from './migrations/1764806400000-EditorialReview';
import { FigureSetEntity } from '../exports/figure-set.entity';
import { StudioExports1764979200000 } from './migrations/1764979200000-StudioExports';
import { FigureSetExports1765238400000 } from './migrations/1765238400000-FigureSetExports';
import { UserLinkEntity } from '../users/user-link.entity';
import { PeopleAndPublications1765584000000 } from './migrations/1765584000000-PeopleAndPublications';
import { PrintProduction1765411200000 } from './migrations/1765411200000-PrintProduction';
import { FigureUnitsAndSetCaptions1765600000000 } from './migrations/1765600000000-FigureUnitsAndSetCaptions';
import { SwatchbookScope1796200000000 } from './migrations/1796200000000-SwatchbookScope';
import { ColourGate1796225688699 } from './migrations/1796225688699-ColourGate';
import { DeliveryProfileEntity } from '../delivery-profiles/delivery-profile.entity';
import { OutboxEntity } from '../outbox/outbox.entity';
import { Outbox1796188459275 } from './migrations/1796188459275-Outbox';

import { ParameterFreeQueryLogger } from './query-logger';

/**
 * Entities and migrations are listed as classes (not globs) so the same list works compiled and under Jest.
 * A new table: its entity in libs/server/src/<feature>/, a hand-written migration with a fresh timestamp in
 * db/migrations/, and one entry in each list below (DEVELOPERS.md "Persistence"). TypeORM runs pending
 * migrations in timestamp order, so keep this list in that order too.
 */
export const ENTITIES = [UserEntity, PublicationEntity, MembershipEntity, FigureEntity, FigureVersionEntity, AssetEntity, JobEntity,
  SwatchbookEntity, SwatchbookVersionEntity, HouseStyleEntity, BatchEntity, BatchItemEntity, ReviewRoundEntity, CommentEntity, AuditEntryEntity, FigureSetEntity, DeliveryProfileEntity,
  OutboxEntity, UserLinkEntity];
export const MIGRATIONS = [Foundation1764633600000, FigureJobs1764720000000, EditorialReview1764806400000, StudioExports1764979200000, FigureSetExports1765238400000, PrintProduction1765411200000,
  PeopleAndPublications1765584000000, FigureUnitsAndSetCaptions1765600000000, Outbox1796188459275, SwatchbookScope1796200000000, ColourGate1796225688699];

/**
 * Time limits of database calls made while answering a request (the api's data source), so a stalled PostgreSQL
 * gives a 503 with the reason within 2 s instead of a hang (issue "Stays up and stays scoped"):
 * - statementMs: PostgreSQL cancels a statement (lock waits included) after this long (SQLSTATE 57014);
 * - queryMs: node-postgres gives up on an answer that never comes (a server that stopped answering at all);
 * - connectMs: opening a connection, or waiting for a free one of the pool. Longer: a fresh connection took over 1.5 s
 *   on the shared 2-core machine under load (sign-ins answered 503 while PostgreSQL was fine); a stalled server is
 *   caught on the pooled connections by the two limits above.
 * The HTTP error filter answers all three with 503. Migrations, the seed and the worker's jobs have no such limit.
 */
export const REQUEST_DB_TIMEOUTS = { statementMs: 1500, queryMs: 1800, connectMs: 5000 } as const;

/**
 * `requestTimeoutMs`: the statement limit (config DB_REQUEST_TIMEOUT_MS, default REQUEST_DB_TIMEOUTS.statementMs);
 * the answer limit keeps the default's 300 ms margin above it. The API specs raise it (apps/api/test/support.ts):
 * on the shared 2-core test machine at load 12+ an ordinary SELECT can take over 1.8 s while a mesh job's sampling
 * threads hold the cores; the fault spec runs with the default.
 */
export function dataSourceOptions(url: string, extra: { poolSize?: number; requestTimeoutMs?: number } = {}): DataSourceOptions {
  const t = REQUEST_DB_TIMEOUTS;
  const ms = extra.requestTimeoutMs;
  const pool = {
    ...(extra.poolSize ? { max: extra.poolSize } : {}),
    ...(ms ? { statement_timeout: ms, query_timeout: ms + (t.queryMs - t.statementMs), connectionTimeoutMillis: Math.max(t.connectMs, ms) } : {}),
  };
  return {
    type: 'postgres',
    url,
    entities: ENTITIES,
    migrations: MIGRATIONS,
    migrationsTableName: 'typeorm_migrations',
    synchronize: false,
    migrationsRun: false,
    logging: ['error'],
    logger: new ParameterFreeQueryLogger(), // never the query's values (hashes, addresses) in logs
    ...(Object.keys(pool).length ? { extra: pool } : {}),
  };
}
