// Catalog parameter lookups and scaling, free of Tone so pages can use them before any audio loads.
import { EFFECTS, type EffectParam } from '$lib/engine/effects';
import type { EffectId } from '$lib/engine/types';

export function spec(effect: EffectId, param: string): EffectParam {
	const found = EFFECTS[effect].params.find((p) => p.id === param);
	if (!found) throw new Error(`${effect} has no parameter ${param}`);
	return found;
}

/** 0..1 onto a continuous parameter's range (linear, or exponential for frequencies and times). */
export function scaleParam(param: EffectParam, value: number): number {
	const v = Math.min(1, Math.max(0, value));
	if (!param.range) return v;
	const { min, max, curve } = param.range;
	return curve === 'exp' ? min * Math.pow(max / min, v) : min + (max - min) * v;
}
