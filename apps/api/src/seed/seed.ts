import { hash } from 'bcryptjs';
import type { DataSource } from 'typeorm';
import { UserEntity, PublicationEntity, MembershipEntity, DeliveryProfileEntity } from '@psiform/server';
import { DEMO_DELIVERY_PROFILE, DEMO_PASSWORD, DEMO_PUBLICATION, DEMO_USERS } from './demo-scenario';
import { BCRYPT_ROUNDS } from '../users/password';

export interface SeedSummary {
  publication: { title: string; created: boolean };
  usersCreated: string[];
  usersExisting: string[];
  membershipsAdded: number;
}

/**
 * Loads the demo scenario; idempotent: existing rows are left exactly as they are
 * (no password re-hash, no updates), missing ones are inserted. One transaction.
 */
export async function runSeed(ds: DataSource): Promise<SeedSummary> {
  return ds.transaction(async (em) => {
    const pubs = em.getRepository(PublicationEntity);
    const users = em.getRepository(UserEntity);
    const members = em.getRepository(MembershipEntity);

    const pubInsert = await pubs.createQueryBuilder().insert().values(DEMO_PUBLICATION).orIgnore().execute();
    const pubCreated = (pubInsert.raw as unknown[]).length > 0;

    const summary: SeedSummary = { publication: { title: DEMO_PUBLICATION.title, created: pubCreated }, usersCreated: [], usersExisting: [], membershipsAdded: 0 };
    for (const u of DEMO_USERS) {
      let row = await users.findOne({ where: { email: u.email } });
      if (row) {
        summary.usersExisting.push(u.email);
      } else {
        const passwordHash = await hash(DEMO_PASSWORD, BCRYPT_ROUNDS);
        row = await users.save(users.create({ ...u, passwordHash }));
        summary.usersCreated.push(u.email);
      }
      const m = await members
        .createQueryBuilder()
        .insert()
        .values({ publicationId: DEMO_PUBLICATION.id, userId: row.id, role: row.role })
        .orIgnore()
        .execute();
      summary.membershipsAdded += (m.raw as unknown[]).length;
    }
    // The demo book's delivery profile, only when it has none (an art director's later edits stay).
    await em.getRepository(DeliveryProfileEntity).createQueryBuilder().insert().values({ publicationId: DEMO_PUBLICATION.id, profile: DEMO_DELIVERY_PROFILE, updatedBy: null }).orIgnore().execute();
    return summary;
  });
}

export function formatSeedSummary(s: SeedSummary): string {
  return [
    `Demo publication "${s.publication.title}": ${s.publication.created ? 'created' : 'already present'}`,
    `Demo users created: ${s.usersCreated.length ? s.usersCreated.join(', ') : 'none'}; already present: ${s.usersExisting.length}`,
    `Memberships added: ${s.membershipsAdded}`,
  ].join('\n');
}
