import type { ObjectLiteral, SelectQueryBuilder } from 'typeorm';
import { UserEntity } from './user.entity';

/**
 * One way every feature reads "this row and the display name of the user it points at" (an audit entry's actor, a
 * comment's author, a house style's override signer): a left join, so a row whose user was removed still comes back,
 * with a null name. `userColumn` is the row's column holding the user id, e.g. 'e.actor_id'.
 */
export function joinUserName<T extends ObjectLiteral>(qb: SelectQueryBuilder<T>, userColumn: string): SelectQueryBuilder<T> {
  return qb.leftJoin(UserEntity, 'u', `u.id = ${userColumn}`).addSelect('u.display_name', 'user_name');
}

/** Runs a query built with joinUserName: each entity with its user's display name (null when there is none). */
export async function rowsWithUserName<T extends ObjectLiteral>(qb: SelectQueryBuilder<T>): Promise<{ row: T; userName: string | null }[]> {
  const { entities, raw } = await qb.getRawAndEntities();
  return entities.map((row, i) => ({ row, userName: (raw[i]?.user_name as string | null | undefined) ?? null }));
}
