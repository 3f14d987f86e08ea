// How parameter values read on screen: divisions with their length at the tempo, ranges in units.
import { EFFECTS, divisionFromValue, divisionMs, type EffectParam } from '$lib/engine/effects';
import type { EffectId } from '$lib/engine/types';
import { scaleParam } from './params';

/** A parameter as it reads: beat-synced ones as a division (with its length when `bpm` is given). */
export function formatParam(effect: EffectId, index: number, value: number, bpm?: number): string {
	const param: EffectParam = EFFECTS[effect].params[index];
	if (param.divisions) {
		const division = divisionFromValue(param.divisions, value);
		return bpm === undefined ? division : `${division} · ${formatMs(divisionMs(division, bpm))}`;
	}
	if (!param.range || param.range.unit === '') return `${Math.round(value * 100)} %`;
	const v = scaleParam(param, value);
	const { unit } = param.range;
	if (unit === 'Hz') return v >= 1000 ? `${(v / 1000).toFixed(1)} kHz` : `${Math.round(v)} Hz`;
	if (unit === 's') return `${v.toFixed(1)} s`;
	if (unit === 'bits' || unit === 'stages') return `${Math.round(v)} ${unit}`;
	return `${v.toFixed(1)} ${unit}`;
}

export function formatMs(ms: number): string {
	return ms >= 1000 ? `${(ms / 1000).toFixed(2)} s` : `${ms.toFixed(ms < 100 ? 1 : 0)} ms`;
}

export function formatDb(db: number): string {
	if (!Number.isFinite(db) || db < -90) return '−∞ dB';
	return `${db < 0 ? '−' : '+'}${Math.abs(db).toFixed(1)} dB`;
}
