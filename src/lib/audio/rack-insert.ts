// One rack as an insert on one deck: dry and wet (equal-power, DESIGN.md §5) around its chain,
// up to four positions in series, each with its own effect, on and three parameters. It follows
// the rack's state; effect instances are built before the first press when the rig is told what a
// mapping may load (prepare), else the first time the rack is routed to this deck, and a position's
// effect changes with a short crossfade to an instance it keeps.
import { Gain } from 'tone';
import { CHAIN_MAX, type DeckId, type EffectId, type RackState } from '$lib/engine/types';
import type { BeatClock } from './beat-clock';
import { createEffect, type RackEffect } from './effects';
import { rampParam, type EffectOptions } from './effects/effect';
import { equalPowerGains } from './mix';
import { positionActive, positionValues, rackEngaged } from './chain-values';

/** Every gain move in a rack ramps this long (seconds): short enough to feel instant, no click. */
export const RACK_FADE = 0.003;

interface Loaded {
	id: EffectId;
	effect: RackEffect;
	engaged: boolean;
}

/**
 * One chain position between two summing nodes it shares with its neighbours; the effect's output
 * level is its wet. It keeps one instance per effect it has held (or was told it may hold): an
 * effect swapped out rings down, then waits with its input unplugged until it is loaded again, so a
 * press that changes the effect only moves gains and parameters instead of building nodes.
 */
class PositionStage {
	#bypass = new Gain(1);
	loaded: Loaded | null = null;
	#retired: (Loaded & { until: number })[] = [];
	#idle = new Map<EffectId, RackEffect>();

	constructor(
		readonly input: Gain,
		readonly output: Gain
	) {
		this.input.chain(this.#bypass, this.output);
	}

	/** Instances this position holds (loaded, ringing down or waiting), for tests and the bench. */
	get instances(): number {
		return (this.loaded ? 1 : 0) + this.#retired.length + this.#idle.size;
	}

	/** Builds a waiting instance of each effect not held yet; answers how many it built. */
	prepare(ids: readonly EffectId[], options: EffectOptions, budget: number): number {
		let built = 0;
		for (const id of ids) {
			if (built >= budget) break;
			if (this.loaded?.id === id || this.#idle.has(id) || this.#retired.some((l) => l.id === id)) continue;
			const effect = createEffect(id, options);
			effect.output.gain.setValueAtTime(0, 0);
			effect.output.connect(this.output);
			this.#idle.set(id, effect);
			built++;
		}
		return built;
	}

	load(id: EffectId | null, options: EffectOptions, time: number) {
		if (this.loaded?.id === id) return;
		this.#sweep();
		if (this.loaded) {
			rampParam(this.loaded.effect.output.gain, 0, time, RACK_FADE);
			if (this.loaded.engaged) this.loaded.effect.release(time + RACK_FADE);
			this.#retired.push({ ...this.loaded, until: time + 0.5 });
			this.loaded = null;
		}
		if (id === null) return;
		const ringing = this.#retired.findIndex((l) => l.id === id);
		if (ringing >= 0) {
			// Swapped out a moment ago and still plugged in: take it back as it is.
			const [back] = this.#retired.splice(ringing, 1);
			this.loaded = { id, effect: back.effect, engaged: false };
			return;
		}
		let effect = this.#idle.get(id);
		if (effect) this.#idle.delete(id);
		else {
			effect = createEffect(id, options);
			effect.output.gain.setValueAtTime(0, 0); // silent until the position engages (a past time: at once)
			effect.output.connect(this.output);
		}
		this.input.connect(effect.input);
		this.loaded = { id, effect, engaged: false };
	}

	follow(active: boolean, bypass: number, time: number) {
		rampParam(this.#bypass.gain, bypass, time, RACK_FADE);
		const loaded = this.loaded;
		if (!loaded) return;
		rampParam(loaded.effect.output.gain, active ? 1 : 0, time, RACK_FADE);
		if (active && !loaded.engaged) loaded.effect.engage(time);
		if (!active && loaded.engaged) loaded.effect.release(time + RACK_FADE);
		loaded.engaged = active;
	}

	setTempo(bpm: number, time: number) {
		for (const effect of this.#all()) effect.setTempo(bpm, time);
	}

	/** Effects swapped out a while ago have rung down: unplug their input and keep them waiting. */
	#sweep() {
		const now = this.input.context.currentTime;
		this.#retired = this.#retired.filter((l) => {
			if (l.until > now) return true;
			this.input.disconnect(l.effect.input);
			if (this.#idle.has(l.id)) l.effect.dispose();
			else this.#idle.set(l.id, l.effect);
			return false;
		});
	}

	#all(): RackEffect[] {
		return [
			...this.#retired.map((l) => l.effect),
			...(this.loaded ? [this.loaded.effect] : []),
			...this.#idle.values()
		];
	}

	dispose() {
		for (const effect of this.#all()) effect.dispose();
		this.#retired = [];
		this.#idle.clear();
		this.loaded = null;
		this.#bypass.dispose();
	}
}

/** A rack on one deck, between the deck's summing nodes before and after it (the deck owns those). */
export class RackInsert {
	#dry = new Gain(1);
	#wet = new Gain(0);
	#joints: Gain[] = [];
	#positions: PositionStage[] = [];
	#built = false;
	#direct: boolean;
	#bpm: number;

	constructor(
		readonly rack: number,
		readonly deck: DeckId,
		readonly clock: BeatClock,
		readonly input: Gain,
		public output: Gain
	) {
		this.#bpm = clock.bpmAt(clock.origin);
		// Offline nothing sounds until the whole render is set up, so a rack not (yet) routed here
		// passes straight through and is rewired when it is: a node fewer per idle rack and deck.
		this.#direct = input.context.isOffline;
		if (this.#direct) this.input.connect(this.output);
		else this.input.chain(this.#dry, this.output);
	}

	/** Applies the rack's state at `time` (all of one event's changes share that time). */
	follow(rack: RackState, time: number) {
		const routed = rack.routes[this.deck];
		if (routed && !this.#built) this.#build();
		const engaged = rackEngaged(rack, this.deck);
		const gains = engaged ? equalPowerGains(rack.mix) : { dry: 1, wet: 0 };
		rampParam(this.#dry.gain, gains.dry, time, RACK_FADE);
		rampParam(this.#wet.gain, gains.wet, time, RACK_FADE);
		// A lone effect gives the wet path only its own sound; in a chain of several, an effect that
		// adds (echoes, reverb) keeps its input too, so the positions after it hear the music as well.
		const several = rack.chain.filter(positionActive).length > 1;
		this.#positions.forEach((stage, i) => {
			const position = rack.chain[i];
			stage.load(position.effect, { bpm: this.#bpm, clock: this.clock }, time);
			const active = positionActive(position);
			if (stage.loaded) {
				for (const [param, value] of Object.entries(positionValues(position))) {
					stage.loaded.effect.set(param, value, time);
				}
			}
			const adds = stage.loaded?.effect.blend === 'add' && several;
			stage.follow(engaged && active, active && !adds ? 0 : 1, time);
		});
	}

	/** Moves this insert's output to another summing node (the deck grew a rack after it). */
	retarget(output: Gain) {
		if (this.#direct) {
			this.input.disconnect(this.output);
			this.input.connect(output);
		} else {
			this.#dry.disconnect(this.output);
			this.#dry.connect(output);
		}
		if (this.#built) {
			this.#wet.disconnect(this.output);
			this.#wet.connect(output);
		}
		this.output = output;
	}

	setTempo(bpm: number, time: number) {
		this.#bpm = bpm;
		for (const stage of this.#positions) stage.setTempo(bpm, time);
	}

	/**
	 * Builds this insert and a waiting instance of each effect a position may hold (`effects[i]`
	 * for position i), at most `budget` in all; answers how many it built.
	 */
	prepare(effects: readonly (readonly EffectId[])[], budget: number): number {
		if (!this.#built) this.#build();
		let built = 0;
		this.#positions.forEach((stage, i) => {
			built += stage.prepare(effects[i] ?? [], { bpm: this.#bpm, clock: this.clock }, budget - built);
		});
		return built;
	}

	/** Effect instances held by this insert's positions, for tests and the bench. */
	get instances(): number {
		return this.#positions.reduce((n, s) => n + s.instances, 0);
	}

	/** Effects currently loaded, for tests and the sounds page. */
	get effects(): (EffectId | null)[] {
		return this.#positions.map((s) => s.loaded?.id ?? null);
	}

	#build() {
		this.#built = true;
		if (this.#direct) {
			this.input.disconnect(this.output);
			this.input.chain(this.#dry, this.output);
			this.#direct = false;
		}
		this.#joints = Array.from({ length: CHAIN_MAX - 1 }, () => new Gain(1));
		const joints = [this.input, ...this.#joints, this.#wet];
		this.#positions = Array.from({ length: CHAIN_MAX }, (_, i) => new PositionStage(joints[i], joints[i + 1]));
		this.#wet.connect(this.output);
	}

	dispose() {
		for (const s of this.#positions) s.dispose();
		for (const n of [this.#dry, this.#wet, ...this.#joints]) n.dispose();
	}
}
