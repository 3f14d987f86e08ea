// The effect catalog as sound: one class per catalog id (engine/effects.ts names them).
import type { EffectId } from '$lib/engine/types';
import { Bitcrush } from './bitcrush';
import { Echo } from './echo';
import type { EffectOptions, RackEffect } from './effect';
import { FilterSweep } from './filter';
import { Flanger } from './flanger';
import { Gate } from './gate';
import { Phaser } from './phaser';
import { PingPong } from './ping-pong';
import { Reverb } from './reverb';
import { Stutter } from './stutter';
import { TapeEcho } from './tape-echo';

export { RackEffect } from './effect';

const CLASSES: Record<EffectId, new (options: EffectOptions) => RackEffect> = {
	echo: Echo,
	'ping-pong': PingPong,
	'tape-echo': TapeEcho,
	reverb: Reverb,
	filter: FilterSweep,
	stutter: Stutter,
	gate: Gate,
	bitcrush: Bitcrush,
	flanger: Flanger,
	phaser: Phaser
};

export function createEffect(id: EffectId, options: EffectOptions): RackEffect {
	return new CLASSES[id](options);
}
