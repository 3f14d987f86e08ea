// The hearing caution (DESIGN.md §5): shown the first time sound starts, acknowledged once and
// remembered in this browser.

export const CAUTION_KEY = 'padproof.hearing-caution';

export class HearingCaution {
	acknowledged = $state(false);

	constructor(private storage: Pick<Storage, 'getItem' | 'setItem'> | null = globalThis.localStorage ?? null) {
		this.acknowledged = storage?.getItem(CAUTION_KEY) === 'acknowledged';
	}

	acknowledge(): void {
		this.acknowledged = true;
		try {
			this.storage?.setItem(CAUTION_KEY, 'acknowledged');
		} catch {
			// Private modes may refuse storage; the caution then shows again next visit, which is safe.
		}
	}
}
