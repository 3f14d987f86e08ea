// The drill editor posts the whole document as JSON in one field, with the mapping it is played on.
import { z } from 'zod';

const form = z.object({
	mappingId: z.string().min(1, { error: 'Choose the mapping the drill is played on.' }).max(64),
	// Empty: the newest version (a new drill) or the one it is played on (a saved drill).
	mappingVersion: z
		.union([z.literal(''), z.coerce.number().int().min(1)], { error: 'Choose a version of the mapping.' })
		.optional(),
	document: z.string().min(2).max(2_000_000, { error: 'The drill is too large.' })
});

export function readDrillForm(data: FormData) {
	const parsed = form.safeParse({
		mappingId: data.get('mappingId'),
		mappingVersion: data.get('mappingVersion') ?? undefined,
		document: data.get('document')
	});
	if (!parsed.success) return { ok: false as const, message: parsed.error.issues[0].message };
	try {
		return {
			ok: true as const,
			data: {
				mappingId: parsed.data.mappingId,
				mappingVersion: parsed.data.mappingVersion || undefined,
				document: JSON.parse(parsed.data.document) as unknown
			}
		};
	} catch {
		return { ok: false as const, message: 'The drill could not be read; reload the page and try again.' };
	}
}
