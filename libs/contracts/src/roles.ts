/** Roles of Psiform users. One role per user; access is further scoped by publication membership. */
export const ROLES = ['illustrator', 'editor', 'art_director', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}

/** Human labels used by the client (our own wording). */
export const ROLE_LABELS: Record<Role, string> = {
  illustrator: 'Illustrator',
  editor: 'Editor',
  art_director: 'Art director',
  admin: 'Administrator',
};
