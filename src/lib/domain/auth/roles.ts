/** Who works in the shop, and what each kind of person may do. */

export const ROLES = ['owner', 'lead', 'tech', 'office'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABEL: Record<Role, string> = {
	owner: 'Owner',
	lead: 'Lead',
	tech: 'Tech',
	office: 'Office'
};

export function isRole(value: unknown): value is Role {
	return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}

/** People who move units on the floor. The owner of a small shop works the floor too. */
export const FLOOR_ROLES: readonly Role[] = ['tech', 'lead', 'owner'];

/** People who steer the floor: may move work anywhere, hold, release and send back. */
export const STEERING_ROLES: readonly Role[] = ['lead', 'owner'];

/** People who take things in: lots, customer units, orders. */
export const INTAKE_ROLES: readonly Role[] = ['office', 'lead', 'owner'];

export const ALL_ROLES: readonly Role[] = ROLES;
