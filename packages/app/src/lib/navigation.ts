import type { Role } from '../api/types.ts';

export interface NavItem {
  readonly name: string;
  readonly label: string;
  readonly roles: readonly Role[];
}

// The rail shows only the screens a person's roles open (DESIGN.md "Users and roles").
const ITEMS: readonly NavItem[] = [
  { name: 'projects', label: 'Projects', roles: ['designer', 'reviewer', 'admin'] },
  { name: 'reviews', label: 'My reviews', roles: ['reviewer'] },
  { name: 'downloads', label: 'Downloads', roles: ['firmware', 'designer', 'reviewer'] },
  { name: 'conformance', label: 'Conformance', roles: ['firmware', 'designer'] },
  { name: 'admin', label: 'Admin', roles: ['admin'] },
];

export function navItemsFor(roles: readonly Role[]): NavItem[] {
  return ITEMS.filter((item) => item.roles.some((role) => roles.includes(role)));
}

/** Routes drawn without the rail. */
export function isBareRoute(name: unknown): boolean {
  return name === 'sign-in' || name === 'review' || name === undefined;
}
