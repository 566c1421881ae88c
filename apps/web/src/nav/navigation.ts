import { ROLES, type Role } from '@psiform/contracts';
import type { IconName } from '@blueprintjs/icons';

/** One place in the app, who may open it, and whether it is built yet. */
export interface NavItem {
  path: string;
  label: string;
  icon: IconName;
  roles: readonly Role[];
  /** false: the route shows an honest "coming in a later release" panel. */
  ready: boolean;
  /** One sentence on what the place is for (shown on the not-yet-built panel). */
  purpose: string;
}

export const NAV_ITEMS: readonly NavItem[] = [
  {
    path: '/publications',
    label: 'Publications',
    icon: 'book',
    roles: ROLES,
    ready: true,
    purpose: 'The books and journal volumes you work on.',
  },
  {
    path: '/library',
    label: 'Library',
    icon: 'layers',
    roles: ['illustrator', 'editor', 'art_director'],
    ready: true,
    purpose: 'Your figures and their versions across every publication you belong to.',
  },
  {
    path: '/composer',
    label: 'Composer',
    icon: 'function',
    roles: ['illustrator'],
    ready: true,
    purpose: 'Choose states, coefficients, Z and the surface rule, and see the isosurfaces as you go.',
  },
  {
    path: '/sets',
    label: 'Figure sets',
    icon: 'grid-view',
    roles: ['illustrator'],
    ready: true,
    purpose: 'Several figures as labelled panels of one image, at one camera and one scale, exported like a single figure.',
  },
  {
    path: '/review',
    label: 'Review desk',
    icon: 'endorsed',
    roles: ['editor', 'art_director'],
    ready: true,
    purpose: 'The queue of proofs waiting for your comments, change requests and approval.',
  },
  {
    path: '/swatchbooks',
    label: 'Swatchbooks',
    icon: 'tint',
    roles: ['art_director'],
    ready: true,
    purpose: 'Palettes and house styles, pinned one swatchbook per publication.',
  },
  {
    path: '/people',
    label: 'People',
    icon: 'people',
    roles: ['admin'],
    ready: true,
    purpose: 'Accounts, roles and publication memberships.',
  },
  {
    path: '/manage/publications',
    label: 'Manage publications',
    icon: 'manual',
    roles: ['admin'],
    ready: true,
    purpose: 'Create and edit publications, and choose who works on each and in which role.',
  },
];

/** Routes that are not places in the navigation (reached from the places above), with who may open them. */
export interface SubRoute {
  path: string;
  /** Names the page in the 403 panel. */
  label: string;
  roles: readonly Role[];
}

const FIGURE_READERS: readonly Role[] = ['illustrator', 'editor', 'art_director'];

export const SUB_ROUTES: readonly SubRoute[] = [
  { path: '/publications/:publicationId/figures', label: 'Library', roles: FIGURE_READERS },
  { path: '/figures/new', label: 'New figure (the Composer)', roles: ['illustrator'] },
  { path: '/figures/:figureId', label: 'Figure', roles: FIGURE_READERS },
  { path: '/figures/:figureId/studio', label: 'Studio', roles: ['illustrator'] },
  { path: '/uploads/new', label: 'Upload a density cube', roles: ['illustrator'] },
  { path: '/figures/:figureId/proof', label: 'Proof', roles: FIGURE_READERS },
  // Everyone may read swatchbooks and house styles; only art directors change them (the server enforces it).
  { path: '/swatchbooks/:swatchbookId', label: 'Swatchbook', roles: ROLES },
  { path: '/publications/:publicationId/house-style', label: 'House style', roles: ROLES },
  { path: '/manage/publications/:publicationId', label: 'Manage publication', roles: ['admin'] },
  // Every member reads the delivery profile; art directors (and admins) set it (the server enforces it).
  { path: '/publications/:publicationId/delivery-profile', label: 'Delivery profile', roles: ROLES },
];

export function navItemsFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((item) => item.roles.includes(role));
}

export function canOpen(role: Role, item: NavItem): boolean {
  return item.roles.includes(role);
}
