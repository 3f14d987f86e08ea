// Level arithmetic shared by racks, master and tests. Equal-power law as in the Web Audio API's
// StereoPannerNode algorithm: gains cos(x·π/2) and sin(x·π/2) for x in 0..1.

/** The master's level when sound first starts (DESIGN.md §5: moderate). */
export const DEFAULT_MASTER_DB = -12;

export interface MixGains {
	dry: number;
	wet: number;
}

export function equalPowerGains(mix: number): MixGains {
	const x = Math.min(1, Math.max(0, mix));
	// Exact ends, so a rack at mix 0 or 1 is sample-identical to the dry or the wet path.
	if (x === 0) return { dry: 1, wet: 0 };
	if (x === 1) return { dry: 0, wet: 1 };
	return { dry: Math.cos((x * Math.PI) / 2), wet: Math.sin((x * Math.PI) / 2) };
}

export function dbToGain(db: number): number {
	return Math.pow(10, db / 20);
}

export function gainToDb(gain: number): number {
	return gain > 0 ? 20 * Math.log10(gain) : -Infinity;
}
