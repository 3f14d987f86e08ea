// Controller profiles made by MIDI learn, kept in this browser until the mapping editor stores
// them with a mapping. What comes back from storage is checked by the engine's own mapping schema.
import { parseMapping, type ControllerProfile } from '$lib/engine';

const KEY = 'padproof.controller-profiles';

export function checkProfile(value: unknown): ControllerProfile | null {
	const result = parseMapping({
		version: 1,
		name: 'profile check',
		decks: 2,
		profile: value,
		counters: [],
		bindings: []
	});
	return result.ok ? result.mapping.profile : null;
}

export class SavedProfiles {
	list = $state.raw<ControllerProfile[]>([]);
	#storage: Storage | null;

	constructor(storage: Storage | null = typeof localStorage === 'undefined' ? null : localStorage) {
		this.#storage = storage;
		try {
			const raw: unknown = JSON.parse(storage?.getItem(KEY) ?? '[]');
			this.list = (Array.isArray(raw) ? raw : []).map(checkProfile).filter((p): p is ControllerProfile => p !== null);
		} catch {
			this.list = [];
		}
	}

	/** Adds or replaces (by name) a profile; false when it doesn't pass the schema. */
	save(profile: ControllerProfile): boolean {
		const checked = checkProfile(profile);
		if (!checked) return false;
		this.list = [...this.list.filter((p) => p.name !== checked.name), checked];
		this.#storage?.setItem(KEY, JSON.stringify(this.list));
		return true;
	}
}
