// Sound for a replay: one realtime AudioRig that follows the cursor. While the cursor plays, the
// changes it passes are applied as they go by (at any speed: the rig's session clock is pinned
// to the cursor every frame); a jump (seek, step, a new mapping) hands the rig the whole state at
// the cursor; pause stops the decks. Audio modules load on demand so the page stays light.
import type { DeckId, RigChange, RigState } from '$lib/engine';
import type { AudioRig } from '$lib/audio/rig';

export type SoundStatus = 'off' | 'starting' | 'on' | 'unavailable';

/** The demo loop each deck plays in a replay (a recording keeps no audio of its own decks). */
export const REPLAY_LOOPS: Record<DeckId, string> = {
	A: 'glass-steps',
	B: 'night-bus',
	C: 'porch-light',
	D: 'coil-run'
};

const silent = (state: RigState): RigState => ({
	...state,
	decks: { A: { playing: false }, B: { playing: false }, C: { playing: false }, D: { playing: false } }
});

export class ReplaySound {
	status = $state<SoundStatus>('off');
	problem = $state<string | null>(null);
	#rig: AudioRig | null = null;

	/** Must begin inside a user gesture: browsers only start audio then. */
	async start(tempo: number, state: RigState): Promise<void> {
		if (this.status === 'starting' || this.status === 'on') return;
		this.status = 'starting';
		this.problem = null;
		try {
			const tone = await import('tone');
			await tone.start();
			const [{ AudioRig }, { findLoop }, { DEFAULT_MASTER_DB }] = await Promise.all([
				import('$lib/audio/rig'),
				import('$lib/audio/loops/patterns'),
				import('$lib/audio/master')
			]);
			const now = tone.getContext().currentTime;
			const rig = await AudioRig.create({ tempo, origin: now, state: silent(state) });
			rig.master.setLevel(DEFAULT_MASTER_DB, now);
			rig.master.output.toDestination();
			for (const [deck, loop] of Object.entries(REPLAY_LOOPS)) rig.setLoop(deck as DeckId, findLoop(loop));
			rig.startClock();
			this.#rig = rig;
			this.status = 'on';
		} catch (error) {
			this.status = 'unavailable';
			this.problem = `Sound could not start: ${error instanceof Error ? error.message : String(error)}`;
		}
	}

	#pin(cursor: number) {
		if (this.#rig) this.#rig.origin = this.#rig.context.currentTime - cursor / 1000;
	}

	/** The cursor jumped, or playback starts: take over the whole state at once. */
	jump(state: RigState, cursor: number, playing: boolean): void {
		this.#pin(cursor);
		this.#rig?.sync(playing ? state : silent(state));
	}

	/** The cursor played on: the changes it passed since the last frame. */
	follow(changes: readonly RigChange[], cursor: number): void {
		if (!this.#rig || changes.length === 0) return;
		this.#pin(cursor);
		this.#rig.apply(changes);
	}

	stop(): void {
		this.#rig?.dispose();
		this.#rig = null;
		this.status = 'off';
	}
}
