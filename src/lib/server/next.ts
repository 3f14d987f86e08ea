/** Where to go after signing in: only a path inside this app, never another site. */
export function safeNext(value: string | null | undefined, fallback = '/home'): string {
	if (!value || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return fallback;
	return value;
}
