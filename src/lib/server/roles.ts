import { error } from '@sveltejs/kit';

export const ROLES = ['admin', 'teacher', 'student'] as const;
export type Role = (typeof ROLES)[number];

export function isRole(value: unknown): value is Role {
	return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}

/** Who may enter which area: admins everywhere, teachers in teaching areas, everyone signed in elsewhere. */
export function canEnter(role: Role | undefined, area: 'app' | 'teaching' | 'admin'): boolean {
	if (!role) return false;
	if (area === 'admin') return role === 'admin';
	if (area === 'teaching') return role === 'admin' || role === 'teacher';
	return true;
}

interface WithUser<U> {
	user: U | null;
}

/** Checks on the server that the signed-in user may enter `area`; 401 or 403 otherwise. */
export function requireArea<U extends { id: string; role?: string | null }>(
	locals: WithUser<U>,
	area: 'app' | 'teaching' | 'admin'
): U & { role: Role } {
	const user = locals.user;
	if (!user) error(401, 'Please sign in first.');
	const role = isRole(user.role) ? user.role : undefined;
	if (!canEnter(role, area)) {
		error(403, area === 'admin' ? 'Only admins may open this page.' : 'Only teachers may open this page.');
	}
	return { ...user, role: role as Role };
}
