// Keeps a ReplaySound in step with a ReplayCursor: while playing on, the changes passed since the
// last frame; after any jump (seek, step, pause, another mapping), the whole state at the cursor.
// Call during component setup: it registers an effect.
import { untrack } from 'svelte';
import type { RigChange } from '$lib/engine';
import { changesBetween } from './model';
import type { ReplayCursor } from './replay-cursor.svelte';
import type { ReplaySound } from './replay-sound.svelte';
import type { RigSnapshots } from './rig-snapshots';

// Frames further apart than this are a jump, not playback (a dragged cursor, a slow tab).
const MAX_FRAME_MS = 250;

export function followSound(
	sound: ReplaySound,
	cursor: ReplayCursor,
	snapshots: () => RigSnapshots | null,
	changes: () => readonly RigChange[]
) {
	let last = { t: 0, playing: false, on: false, snaps: null as RigSnapshots | null };
	$effect(() => {
		const now = { t: cursor.t, playing: cursor.playing, on: sound.status === 'on', snaps: snapshots() };
		if (!now.on) {
			last = now;
			return;
		}
		untrack(() => {
			if (!now.snaps) return;
			const playedOn =
				last.on &&
				now.playing &&
				last.playing &&
				now.snaps === last.snaps &&
				now.t >= last.t &&
				now.t - last.t < MAX_FRAME_MS * cursor.speed;
			if (playedOn) sound.follow(changesBetween(changes(), last.t, now.t), now.t);
			else sound.jump(now.snaps.stateAt(now.t), now.t, now.playing);
		});
		last = now;
	});
}
