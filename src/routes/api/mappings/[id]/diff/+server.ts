import { db } from '$lib/server/db';
import { Refusal, refusalResponse, signedIn } from '$lib/server/http';
import { getMapping } from '$lib/server/mappings';
import { diffMappings } from '$lib/studio/diff';
import { json } from '@sveltejs/kit';
import { z } from 'zod';
import type { RequestHandler } from './$types';

const Query = z.object({ from: z.coerce.number().int().min(1), to: z.coerce.number().int().min(1) });

/** What changed between two versions, in plain words by pad and step. */
export const GET: RequestHandler = async ({ locals, params, url }) => {
	try {
		const user = signedIn(locals);
		const query = Query.safeParse({ from: url.searchParams.get('from'), to: url.searchParams.get('to') });
		if (!query.success)
			throw new Refusal(
				400,
				'Say which two versions to compare: ?from=1&to=2 (whole numbers from 1).',
				query.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message }))
			);
		const [a, b] = await Promise.all([
			getMapping(db, user.id, params.id, query.data.from),
			getMapping(db, user.id, params.id, query.data.to)
		]);
		return json({ from: query.data.from, to: query.data.to, changes: diffMappings(a.document, b.document) });
	} catch (e) {
		return refusalResponse(e);
	}
};
