/** The main navigation: each entry names the roles that see it (the route's access rule still decides). */
import type { Role } from './domain/auth/roles';

export interface NavItem {
	href: string;
	label: string;
	roles: readonly Role[];
}

export const NAV: readonly NavItem[] = [
	{ href: '/', label: 'Home', roles: ['owner', 'lead', 'office', 'tech'] },
	{ href: '/stations', label: 'Stations', roles: ['owner', 'lead', 'office', 'tech'] },
	{ href: '/units', label: 'Units', roles: ['owner', 'lead', 'office', 'tech'] },
	{ href: '/admin/users', label: 'People', roles: ['owner'] },
	{ href: '/reports', label: 'Reports', roles: ['owner', 'lead'] }
];
