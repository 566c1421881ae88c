import { readFileSync } from 'node:fs';
import type { DeliveryProfile, PublicationKind, Role } from '@psiform/contracts';
import { assetPath } from '@psiform/server';

/**
 * Psiform's own invented demo scenario (assets/demo/scenario.json): publisher, book and people are fictional.
 * DEMO ONLY: every demo account uses the password below; never use it outside a demo database.
 */
export const DEMO_PASSWORD = 'psiform-demo';

interface Scenario {
  publication: { id: string; title: string; publisher: string; kind: PublicationKind; description: string };
  users: { email: string; displayName: string; role: Role }[];
  deliveryProfile: DeliveryProfile;
}
const scenario = JSON.parse(readFileSync(assetPath('demo/scenario.json'), 'utf8')) as Scenario;

/** Fixed id so the seed can insert-if-missing without a natural key. */
export const DEMO_PUBLICATION = scenario.publication;
export const DEMO_USERS = scenario.users;
/** The demo book's delivery profile (set as its art director would). */
export const DEMO_DELIVERY_PROFILE = scenario.deliveryProfile;
