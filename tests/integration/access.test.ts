import { readdirSync, statSync } from 'node:fs';
import { join, relative, sep } from 'node:path';
import { expect, test } from 'vitest';
import { FIELDS, ROUTE_ACCESS, checkAccess, fieldsFor, maySee } from '../../src/lib/server/access';
import { ROLES } from '../../src/lib/domain/auth/roles';

/** Every route id under src/routes, found from the files themselves. */
function routeIds(dir = 'src/routes'): string[] {
	const ids = new Set<string>();
	const walk = (d: string) => {
		for (const name of readdirSync(d)) {
			const p = join(d, name);
			if (statSync(p).isDirectory()) walk(p);
			else if (/^\+(page|server)(\.server)?\.(ts|svelte)$/.test(name)) {
				const rel = relative('src/routes', d).split(sep).join('/');
				ids.add(rel ? `/${rel}` : '/');
			}
		}
	};
	walk(dir);
	return [...ids].sort();
}

test('every route has an access rule, and every rule a route', () => {
	const ids = routeIds().map((id) => (id === '/(app)' ? '/(app)' : id));
	const missing = ids.filter((id) => !(id in ROUTE_ACCESS) && !(id === '/' && '/(app)' in ROUTE_ACCESS));
	expect(missing, 'routes without an access rule').toEqual([]);
	const stale = Object.keys(ROUTE_ACCESS).filter((id) => !ids.includes(id));
	expect(stale, 'rules without a route').toEqual([]);
});

test('the rules say what the shop expects', () => {
	expect(checkAccess('/(app)/admin/users', 'GET', 'tech')).toBe('forbidden');
	expect(checkAccess('/(app)/admin/users', 'POST', 'lead')).toBe('forbidden');
	expect(checkAccess('/(app)/admin/users', 'GET', 'owner')).toBe('allow');
	expect(checkAccess('/(app)/units', 'GET', null)).toBe('sign-in');
	expect(checkAccess('/api/units/[serial=serial]/events', 'POST', 'office')).toBe('forbidden');
	expect(checkAccess('/api/units/[serial=serial]/events', 'POST', 'tech')).toBe('allow');
	expect(checkAccess('/(app)/stations/[code=code]', 'GET', 'office')).toBe('allow');
	expect(checkAccess('/(app)/stations/[code=code]', 'POST', 'office')).toBe('forbidden');
	expect(checkAccess('/login', 'POST', null)).toBe('allow');
	expect(checkAccess('/not/listed', 'GET', 'owner')).toBe('unlisted');
});

test('pages wholly about customers and their quotes open only to roles that may see those fields', () => {
	for (const id of ['/(app)/orders', '/(app)/orders/[id=id]']) {
		for (const role of ROLES) {
			if (checkAccess(id, 'GET', role) !== 'allow') continue;
			expect(maySee(role, 'customer'), `${role} reads ${id}`).toBe(true);
			expect(maySee(role, 'quoteMoney'), `${role} reads ${id}`).toBe(true);
		}
	}
	// the floor sees no customers and no money; per-lot yields are the owner's
	expect(FIELDS.filter((f) => maySee('tech', f))).toEqual([]);
	expect(ROLES.filter((r) => maySee(r, 'lotYield'))).toEqual(['owner']);
	expect(fieldsFor('office')).toEqual({ customer: true, lotCost: true, quoteMoney: true, lotYield: false });
});
