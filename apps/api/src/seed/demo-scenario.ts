import type { PublicationKind, Role } from '@psiform/contracts';

/**
 * Psiform's own invented demo scenario: publisher, book and people are fictional.
 * DEMO ONLY: every demo account uses the password below; never use it outside a demo database.
 */
export const DEMO_PASSWORD = 'psiform-demo';

export const DEMO_PUBLICATION: { id: string; title: string; publisher: string; kind: PublicationKind; description: string } = {
  // Fixed id so the seed can insert-if-missing without a natural key.
  id: '6d1f3c2a-5b7e-4f10-9a3c-0e8b7d2f4a01',
  title: 'Shells and Lobes: Inorganic Structure for Undergraduates',
  publisher: 'Brackwater & Thale Academic',
  kind: 'book',
  description:
    'First-year inorganic chemistry textbook, first edition in production. Orbital figures for the chapters on atomic structure, periodic trends and bonding are being drawn and proofed.',
};

export const DEMO_USERS: { email: string; displayName: string; role: Role }[] = [
  { email: 'illustrator@demo.psiform.test', displayName: 'Ilse Marwick', role: 'illustrator' },
  { email: 'editor@demo.psiform.test', displayName: 'Tomas Edevane', role: 'editor' },
  { email: 'artdirector@demo.psiform.test', displayName: 'Priya Castellan', role: 'art_director' },
  { email: 'admin@demo.psiform.test', displayName: 'Ada Northcott', role: 'admin' },
];
