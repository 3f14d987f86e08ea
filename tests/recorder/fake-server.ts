import type { SessionEvent } from '$lib/engine';
import { CHUNK_MAX_BYTES, CHUNK_MAX_EVENTS } from '$lib/recorder/limits';

/**
 * A stand-in for Padproof's session endpoints with the server's rules: chunks are kept once per
 * number, a different chunk under a used number and a chunk after "finish" are refused (409),
 * chunks over the size limits too (413). `refuse(seq)` makes it refuse one chunk number (422).
 */
export function fakeServer() {
	const sessions = new Map<string, { chunks: Map<number, SessionEvent[]>; finished: boolean; name: string }>();
	let online = true;
	let posts = 0;
	const refused = new Set<number>();
	const bodies: number[] = [];
	const fetch = async (input: RequestInfo | URL, init?: RequestInit): Promise<Response> => {
		if (!online) throw new TypeError('Failed to fetch');
		const url = String(input);
		const body = init?.body ? JSON.parse(String(init.body)) : null;
		const reply = (status: number, data: unknown) =>
			new Response(JSON.stringify(data), { status, headers: { 'content-type': 'application/json' } });
		if (url === '/api/sessions' && init?.method === 'POST') {
			const id = `s${sessions.size + 1}`;
			sessions.set(id, { chunks: new Map(), finished: false, name: body.name ?? 'Take' });
			return reply(201, { id, name: body.name ?? 'Take' });
		}
		const chunk = url.match(/^\/api\/sessions\/(\w+)\/chunks$/);
		if (chunk) {
			posts++;
			bodies.push(new TextEncoder().encode(String(init!.body)).length);
			const s = sessions.get(chunk[1]);
			if (!s) return reply(404, { error: 'That session does not exist' });
			if (bodies.at(-1)! > CHUNK_MAX_BYTES || body.events.length > CHUNK_MAX_EVENTS)
				return reply(413, { error: 'The request is too large.', problems: [] });
			if (refused.has(body.seq)) return reply(422, { error: `Chunk ${body.seq} is not acceptable.`, problems: [] });
			const kept = s.chunks.get(body.seq);
			if (kept && JSON.stringify(kept) !== JSON.stringify(body.events))
				return reply(409, { error: `A different chunk ${body.seq} is kept.`, problems: [] });
			if (!kept && s.finished) return reply(409, { error: 'This recording is finished.', problems: [] });
			if (!kept) s.chunks.set(body.seq, body.events);
			return reply(200, { stored: !kept, duplicate: !!kept });
		}
		const finish = url.match(/^\/api\/sessions\/(\w+)$/);
		if (finish && init?.method === 'PATCH') {
			sessions.get(finish[1])!.finished = true;
			return reply(200, { findings: 0 });
		}
		return reply(404, { error: 'no route' });
	};
	return {
		fetch: fetch as typeof globalThis.fetch,
		sessions,
		get posts() {
			return posts;
		},
		/** Sizes (bytes) of every chunk body posted. */
		bodies,
		refuse(seq: number) {
			refused.add(seq);
		},
		setOnline(value: boolean) {
			online = value;
		},
		events(id: string): SessionEvent[] {
			const s = sessions.get(id)!;
			return [...s.chunks.entries()].sort((a, b) => a[0] - b[0]).flatMap(([, e]) => e);
		}
	};
}
