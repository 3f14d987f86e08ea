const BASE = 'https://padproof.invalid';

/**
 * Where to go after signing in: only a path of this app, never another site. The value is parsed
 * with the WHATWG URL parser against a placeholder origin, so whatever a browser would make of it
 * (tabs and newlines dropped, backslashes read as slashes, `/./` folded) is judged, not the raw text.
 */
export function safeNext(value: string | null | undefined, fallback = '/home'): string {
	if (!value || !value.startsWith('/')) return fallback;
	// Control characters (C0, DEL) and backslashes never occur in our own links; browsers strip or
	// reinterpret them (WHATWG URL: tab/newline removal, "\" as "/"), and in a header they give a 500.
	// eslint-disable-next-line no-control-regex
	if (/[\u0000-\u001f\u007f\\]/.test(value)) return fallback;
	let url: URL;
	try {
		url = new URL(value, BASE);
	} catch {
		return fallback;
	}
	if (url.origin !== BASE || url.pathname.startsWith('//')) return fallback;
	return url.pathname + url.search + url.hash;
}
