/** The main navigation: each entry names the roles that see it (the route's access rule still decides). */
import type { Role } from './domain/auth/roles';

export interface NavItem {
	href: string;
	label: string;
	roles: readonly Role[];
	/** Setup pages sit in a second, smaller row. */
	setup?: boolean;
}

export const NAV: readonly NavItem[] = [
	{ href: '/', label: 'Home', roles: ['owner', 'lead', 'office', 'tech'] },
	{ href: '/stations', label: 'Stations', roles: ['owner', 'lead', 'office', 'tech'] },
	{ href: '/units', label: 'Units', roles: ['owner', 'lead', 'office', 'tech'] },
	{ href: '/lots', label: 'Lots', roles: ['owner', 'lead', 'office', 'tech'] },
	{ href: '/cards', label: 'Cards', roles: ['owner', 'lead', 'office', 'tech'] },
	{ href: '/orders', label: 'Rebuilds', roles: ['owner', 'lead', 'office'] },
	{ href: '/demand', label: 'Demand', roles: ['owner', 'lead', 'office'] },
	{ href: '/stock', label: 'Stock', roles: ['owner', 'lead', 'office'] },
	{ href: '/plan', label: 'Plan', roles: ['owner', 'lead'] },
	{ href: '/shipments', label: 'Shipments', roles: ['owner', 'lead', 'office', 'tech'] },
	{ href: '/reports', label: 'Reports', roles: ['owner', 'lead'] },
	{ href: '/models', label: 'Models', roles: ['owner', 'lead', 'tech'], setup: true },
	{ href: '/admin/users', label: 'People', roles: ['owner'], setup: true },
	{ href: '/admin/floor', label: 'Floor', roles: ['owner'], setup: true },
	{ href: '/admin/checklists', label: 'Checklists', roles: ['owner'], setup: true },
	{ href: '/admin/scrap-reasons', label: 'Scrap reasons', roles: ['owner'], setup: true }
];
