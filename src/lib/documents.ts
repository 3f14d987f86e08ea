// Which of Padproof's documents a parsed file looks like, so an import of the wrong kind can say
// what the file is instead of listing schema problems. Only the shape is read; the importer's
// own schema still validates everything.

export type DocumentKind = 'mapping' | 'session' | 'drill' | 'unknown';

const has = (value: object, ...keys: string[]) => keys.every((k) => k in value);

export function documentKind(value: unknown): DocumentKind {
	if (typeof value !== 'object' || value === null || Array.isArray(value)) return 'unknown';
	if (has(value, 'profile', 'bindings')) return 'mapping';
	if (has(value, 'events', 'tempo')) return 'session';
	if (has(value, 'targets', 'pass')) return 'drill';
	return 'unknown';
}

const names: Record<DocumentKind, string> = {
	mapping: 'a mapping file',
	session: 'a session file',
	drill: 'a drill file',
	unknown: 'an unknown file'
};
const where: Record<DocumentKind, string> = {
	mapping: 'Import it on the Mappings page.',
	session: 'Import it on the Sessions page.',
	drill: 'Drills are added by a teacher in Classes.',
	unknown: ''
};

/** “show.json is a mapping file, not a session. Import it on the Mappings page.” */
export function wrongDocument(file: string, found: DocumentKind, wanted: 'mapping' | 'session'): string {
	return `${file} is ${names[found]}, not a ${wanted}. ${where[found]}`.trim();
}
