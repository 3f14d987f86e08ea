// The live MIDI monitor's log: decoded messages with their timestamps, filtered by device and
// type, and a pause that freezes the view while counting what it let pass.
import { formatBytes, type Decoded } from './decode';

export type MonitorKind = 'note' | 'cc' | 'other' | 'error';
export const MONITOR_KINDS: readonly MonitorKind[] = ['note', 'cc', 'other', 'error'];

export interface MonitorEntry {
	id: number;
	t: number;
	port: string;
	kind: MonitorKind;
	bytes: string;
	summary: string;
	input: string | null; // id of the input it played, null when unmapped or malformed
	inputLabel: string | null;
	problem: string | null;
}

export class MidiMonitorLog {
	entries = $state.raw<MonitorEntry[]>([]);
	paused = $state(false);
	missed = $state(0);
	port = $state('all');
	kind = $state<MonitorKind | 'all'>('all');
	readonly limit: number;
	#next = 1;

	readonly visible = $derived(
		this.entries.filter(
			(e) => (this.port === 'all' || e.port === this.port) && (this.kind === 'all' || e.kind === this.kind)
		)
	);

	constructor(limit = 200) {
		this.limit = limit;
	}

	add(port: string, decoded: Decoded, t: number, describe: (d: Decoded) => string): void {
		if (this.paused) {
			this.missed++;
			return;
		}
		const entry: MonitorEntry = {
			id: this.#next++,
			t,
			port,
			kind: kindOf(decoded),
			bytes: formatBytes(decoded.status === 'error' ? decoded.bytes : decoded.message.bytes),
			summary: describe(decoded),
			input: decoded.status === 'event' ? decoded.input.id : null,
			inputLabel: decoded.status === 'event' ? (decoded.input.label ?? decoded.input.id) : null,
			problem: decoded.status === 'error' ? decoded.error : null
		};
		this.entries = [entry, ...this.entries].slice(0, this.limit);
	}

	togglePause(): void {
		this.paused = !this.paused;
		if (!this.paused) this.missed = 0;
	}

	clear(): void {
		this.entries = [];
		this.missed = 0;
	}
}

function kindOf(decoded: Decoded): MonitorKind {
	if (decoded.status === 'error') return 'error';
	const k = decoded.message.kind;
	return k === 'note-on' || k === 'note-off' ? 'note' : k === 'cc' ? 'cc' : 'other';
}
