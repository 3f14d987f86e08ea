// The studio's saver: PUT /api/mappings/[id] with the version the change started from. A 409
// answer already carries the newest version, so the editor gets it without asking again.
import { api, ApiError } from '$lib/api';
import type { Mapping } from '$lib/engine';
import type { Saver } from './mapping-editor.svelte';

interface Newest {
	version: number;
	document: Mapping;
}

const isNewest = (x: unknown): x is Newest =>
	typeof x === 'object' &&
	x !== null &&
	typeof (x as Newest).version === 'number' &&
	typeof (x as Newest).document === 'object' &&
	(x as Newest).document !== null;

export function mappingSaver(id: string): Saver {
	return async (document, baseVersion) => {
		try {
			const r = await api<{ version: number }>(`/api/mappings/${id}`, { method: 'PUT' }, { document, baseVersion });
			return { ok: true, version: r.version };
		} catch (e) {
			if (e instanceof ApiError && e.status === 409) {
				const newest = (e.body as { newest?: unknown } | null)?.newest;
				if (isNewest(newest)) return { ok: false, conflict: { version: newest.version, document: newest.document } };
			}
			return { ok: false, message: e instanceof ApiError ? e.message : String(e) };
		}
	};
}
