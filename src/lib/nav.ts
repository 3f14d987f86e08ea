export type NavRole = 'admin' | 'teacher' | 'student';

export interface NavItem {
	href: string;
	label: string;
	roles?: NavRole[];
}

const ITEMS: NavItem[] = [
	{ href: '/home', label: 'Home' },
	{ href: '/mappings', label: 'Mappings' },
	{ href: '/sessions', label: 'Sessions' },
	{ href: '/sounds', label: 'Sounds' },
	{ href: '/controllers', label: 'Controllers' },
	{ href: '/classes', label: 'Classes' },
	{ href: '/drills', label: 'Drills', roles: ['teacher', 'admin'] },
	{ href: '/admin', label: 'People', roles: ['admin'] }
];

/** The navigation a role sees; the server checks every area again on its own. */
export function navFor(role: string | undefined | null): NavItem[] {
	if (!role) return [];
	return ITEMS.filter((item) => !item.roles || item.roles.includes(role as NavRole));
}
