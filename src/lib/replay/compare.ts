// Did the fix work? Findings of the same events under two mappings, counted side by side.
import { FINDING_KINDS, type Finding, type FindingKind } from '$lib/engine';

export interface KindCount {
	kind: FindingKind;
	before: number;
	after: number;
}

export interface Comparison {
	before: number;
	after: number;
	kinds: KindCount[]; // only kinds present on either side
	verdict: 'fixed' | 'better' | 'same' | 'worse';
	summary: string; // e.g. "1 finding → 0 findings"
}

const findings = (n: number) => `${n} finding${n === 1 ? '' : 's'}`;

export function compareFindings(original: readonly Finding[], against: readonly Finding[]): Comparison {
	const count = (list: readonly Finding[], kind: FindingKind) => list.filter((f) => f.kind === kind).length;
	const kinds = FINDING_KINDS.map((kind) => ({
		kind,
		before: count(original, kind),
		after: count(against, kind)
	})).filter((k) => k.before + k.after > 0);
	const before = original.length;
	const after = against.length;
	const verdict = after === 0 && before > 0 ? 'fixed' : after < before ? 'better' : after > before ? 'worse' : 'same';
	return { before, after, kinds, verdict, summary: `${findings(before)} → ${findings(after)}` };
}
