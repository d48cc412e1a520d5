import type { Role } from '../../../shared/schemas/common';

/** The areas of the app a role can be given. */
export type Area =
  | 'home'
  | 'units'
  | 'kits'
  | 'classes'
  | 'outcomes'
  | 'review'
  | 'coverage'
  | 'relief'
  | 'school'
  | 'members'
  | 'devMail';

/**
 * Which roles see each area. This mirrors the server's rules for the navigation and the route
 * guards; the server enforces them. Account is for everyone and sits in the user menu.
 */
export const AREA_ROLES: Readonly<Record<Area, readonly Role[]>> = {
  home: ['teacher', 'lead', 'relief', 'admin'],
  units: ['teacher', 'lead'],
  kits: ['teacher', 'admin'],
  outcomes: ['admin', 'lead'],
  classes: ['teacher', 'admin'],
  review: ['lead', 'admin'],
  coverage: ['teacher', 'lead', 'admin'],
  relief: ['relief'],
  school: ['admin'],
  members: ['admin'],
  devMail: ['admin'],
};

/** One entry of the navigation. */
export interface NavItem {
  readonly area: Area;
  readonly label: string;
  /** Absolute router link. */
  readonly path: string;
  /** Material icon ligature. */
  readonly icon: string;
}

/** All entries in display order. */
export const NAV_ITEMS: readonly NavItem[] = [
  { area: 'home', label: 'Home', path: '/', icon: 'home' },
  { area: 'units', label: 'Units', path: '/units', icon: 'menu_book' },
  { area: 'review', label: 'Review', path: '/review', icon: 'rate_review' },
  { area: 'relief', label: 'Relief', path: '/relief', icon: 'assignment_ind' },
  { area: 'kits', label: 'Kits', path: '/kits', icon: 'inventory_2' },
  { area: 'classes', label: 'Classes', path: '/classes', icon: 'groups' },
  { area: 'outcomes', label: 'Outcomes', path: '/outcomes', icon: 'checklist' },
  { area: 'coverage', label: 'Coverage', path: '/coverage', icon: 'grid_on' },
  { area: 'school', label: 'School', path: '/school', icon: 'domain' },
  { area: 'members', label: 'Members', path: '/members', icon: 'manage_accounts' },
  { area: 'devMail', label: 'Mail outbox (development)', path: '/dev/mail', icon: 'mail' },
];

/** What the navigation depends on besides the role. */
export interface NavOptions {
  /** Whether the development mail outbox answers (it is 404 in production). */
  readonly devMailAvailable: boolean;
}

/** The navigation entries for `role`, in display order. */
export function navItemsFor(role: Role, options: NavOptions): NavItem[] {
  return NAV_ITEMS.filter(
    (item) =>
      AREA_ROLES[item.area].includes(role) && (item.area !== 'devMail' || options.devMailAvailable),
  );
}

/** Whether `role` may open `area` (the client-side mirror of the server's rule). */
export function mayOpen(role: Role, area: Area): boolean {
  return AREA_ROLES[area].includes(role);
}
