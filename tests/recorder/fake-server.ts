import type { SessionEvent } from '$lib/engine';

/** A stand-in for Padproof's session endpoints with the server's rules: chunks are kept once per number. */
export function fakeServer() {
	const sessions = new Map<string, { chunks: Map<number, SessionEvent[]>; finished: boolean; name: string }>();
	let online = true;
	let posts = 0;
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
			const s = sessions.get(chunk[1]);
			if (!s) return reply(404, { error: 'That session does not exist' });
			const duplicate = s.chunks.has(body.seq);
			if (!duplicate) s.chunks.set(body.seq, body.events);
			return reply(200, { stored: !duplicate, duplicate });
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
		setOnline(value: boolean) {
			online = value;
		},
		events(id: string): SessionEvent[] {
			const s = sessions.get(id)!;
			return [...s.chunks.entries()].sort((a, b) => a[0] - b[0]).flatMap(([, e]) => e);
		}
	};
}
