import { afterEach, describe, expect, it, vi } from 'vitest';
import { demoMapping, type Mapping } from '$lib/engine';
import { MappingEditor, type Saver } from '$lib/studio/mapping-editor.svelte';
import { mappingSaver } from '$lib/studio/save-mapping';

afterEach(() => vi.unstubAllGlobals());

/** A saver that keeps what it was sent and answers the next version. */
function recording() {
	const sent: { document: Mapping; baseVersion: number }[] = [];
	const save: Saver = async (document, baseVersion) => {
		sent.push({ document, baseVersion });
		return { ok: true, version: baseVersion + 1 };
	};
	return { sent, save };
}

describe('restoring an old version', () => {
	it('makes exactly the old document the newest version, dropping keys the old one lacks', async () => {
		const { tempo: _tempo, ...old } = demoMapping('two-deck');
		const v1 = { ...old, name: 'Set' } as Mapping;
		expect('tempo' in v1).toBe(false);
		const v3: Mapping = {
			...v1,
			tempo: 131,
			bindings: v1.bindings.slice(1),
			counters: [...v1.counters, { id: 'extra', max: 3, rest: 0 }]
		};
		const { sent, save } = recording();
		const editor = new MappingEditor(v3, 3, save, 1);

		expect(editor.replace(v1)).toEqual([]);
		expect(editor.doc).toEqual(v1);
		expect('tempo' in editor.doc).toBe(false);
		await editor.flush();
		expect(sent).toEqual([{ document: v1, baseVersion: 3 }]);
		expect(editor.version).toBe(4);
		expect(editor.state).toBe('saved');

		editor.undo();
		expect(editor.doc).toEqual(v3);
	});

	it('refuses a document the schema refuses and keeps the current one', () => {
		const doc = demoMapping('two-deck');
		const editor = new MappingEditor(doc, 2, recording().save, 1);
		const problems = editor.replace({ ...doc, decks: 3 } as unknown as Mapping);
		expect(problems.length).toBeGreaterThan(0);
		expect(editor.doc).toEqual(doc);
		expect(editor.canUndo).toBe(false);
	});
});

describe('the studio’s saver', () => {
	it('takes the newest version from the 409 answer without asking the server again', async () => {
		const newest = { version: 7, document: { ...demoMapping('two-deck'), tempo: 99 } };
		const calls: { url: string; method: string; body: unknown }[] = [];
		vi.stubGlobal('fetch', async (url: string, init: RequestInit = {}) => {
			calls.push({ url, method: init.method ?? 'GET', body: init.body ? JSON.parse(String(init.body)) : null });
			return new Response(JSON.stringify({ error: 'This mapping was changed elsewhere.', problems: [], newest }), {
				status: 409,
				headers: { 'content-type': 'application/json' }
			});
		});
		const doc = demoMapping('two-deck');
		const editor = new MappingEditor(doc, 6, mappingSaver('m1'), 1);
		editor.change((d) => void (d.tempo = 140));
		await editor.flush();

		expect(calls).toEqual([
			{ url: '/api/mappings/m1', method: 'PUT', body: { document: { ...doc, tempo: 140 }, baseVersion: 6 } }
		]);
		expect(editor.state).toBe('conflict');
		expect(editor.newest).toEqual(newest);
		editor.takeNewest();
		expect(editor.doc.tempo).toBe(99);
		expect(editor.version).toBe(7);
	});

	it('reports another refusal in the server’s words', async () => {
		vi.stubGlobal(
			'fetch',
			async () =>
				new Response(JSON.stringify({ error: 'Only the owner can change this mapping.', problems: [] }), {
					status: 403
				})
		);
		expect(await mappingSaver('m1')(demoMapping('two-deck'), 1)).toEqual({
			ok: false,
			message: 'Only the owner can change this mapping.'
		});
	});
});
