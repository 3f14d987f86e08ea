// The editor's document: every change goes through `change`, which records undo history, checks
// the whole mapping with the engine's schema and saves it (debounced) as the next version. A save
// carries the version it started from; when the server holds a newer one the editor stops in the
// "conflict" state with the newest version in hand, and nothing is overwritten.
import { parseMapping, type Binding, type Mapping, type Problem } from '$lib/engine';

export type SaveState = 'saved' | 'unsaved' | 'saving' | 'invalid' | 'conflict' | 'failed';

export interface Saver {
	(
		document: Mapping,
		baseVersion: number
	): Promise<
		| { ok: true; version: number }
		| { ok: false; conflict: { version: number; document: Mapping } }
		| { ok: false; message: string }
	>;
}

const LIMIT = 100;
const copy = (m: Mapping): Mapping => JSON.parse(JSON.stringify(m));

export class MappingEditor {
	doc = $state.raw<Mapping>(null as unknown as Mapping);
	version = $state(1);
	state = $state<SaveState>('saved');
	problems = $state.raw<Problem[]>([]);
	message = $state<string | null>(null);
	newest = $state.raw<{ version: number; document: Mapping } | null>(null);
	#past = $state.raw<Mapping[]>([]);
	#future = $state.raw<Mapping[]>([]);
	#timer: ReturnType<typeof setTimeout> | null = null;
	#save: Saver;
	#delay: number;
	#pending: Promise<void> | null = null;

	constructor(doc: Mapping, version: number, save: Saver, delay = 700) {
		this.doc = copy(doc);
		this.version = version;
		this.#save = save;
		this.#delay = delay;
	}

	get canUndo() {
		return this.#past.length > 0;
	}
	get canRedo() {
		return this.#future.length > 0;
	}

	binding(input: string): Binding | undefined {
		return this.doc.bindings.find((b) => b.input === input);
	}

	/**
	 * Applies a change to a copy of the document when the result passes the engine's schema; else
	 * leaves the document as it was and returns the problems (so a form can show them).
	 */
	change(edit: (draft: Mapping) => void): Problem[] {
		const draft = copy(this.doc);
		edit(draft);
		const parsed = parseMapping(draft);
		if (!parsed.ok) return parsed.problems;
		this.#past = [...this.#past.slice(-LIMIT + 1), this.doc];
		this.#future = [];
		return this.#set(draft);
	}

	/**
	 * Replaces the whole document with `document` (an old version being restored): the result is
	 * exactly that document, keys the current one has and it lacks included, saved as the newest
	 * version. Undo brings the replaced document back.
	 */
	replace(document: Mapping): Problem[] {
		const next = copy(document);
		const parsed = parseMapping(next);
		if (!parsed.ok) return parsed.problems;
		this.#past = [...this.#past.slice(-LIMIT + 1), this.doc];
		this.#future = [];
		return this.#set(next);
	}

	/** Puts a binding in place of the one on its input (or adds it); null removes it. */
	setBinding(input: string, binding: Binding | null): Problem[] {
		return this.change((d) => {
			const at = d.bindings.findIndex((b) => b.input === input);
			if (binding === null) {
				if (at >= 0) d.bindings.splice(at, 1);
			} else if (at >= 0) d.bindings[at] = binding;
			else d.bindings.push(binding);
		});
	}

	undo() {
		const last = this.#past.at(-1);
		if (!last) return;
		this.#future = [this.doc, ...this.#future];
		this.#past = this.#past.slice(0, -1);
		this.#set(last);
	}

	redo() {
		const next = this.#future[0];
		if (!next) return;
		this.#past = [...this.#past, this.doc];
		this.#future = this.#future.slice(1);
		this.#set(next);
	}

	#set(next: Mapping): Problem[] {
		this.doc = next;
		const parsed = parseMapping(next);
		this.problems = parsed.ok ? [] : parsed.problems;
		if (this.state === 'conflict') return this.problems;
		if (!parsed.ok) {
			this.state = 'invalid';
			this.#cancel();
			return this.problems;
		}
		this.state = 'unsaved';
		this.#cancel();
		this.#timer = setTimeout(() => void this.flush(), this.#delay);
		return [];
	}

	#cancel() {
		if (this.#timer) clearTimeout(this.#timer);
		this.#timer = null;
	}

	/** Saves now if anything is waiting; resolves when the document is saved (or can't be). */
	async flush(): Promise<void> {
		this.#cancel();
		if (this.#pending) await this.#pending;
		if (this.state !== 'unsaved') return;
		this.#pending = this.#run();
		await this.#pending;
		this.#pending = null;
	}

	async #run() {
		this.state = 'saving';
		const sent = this.doc;
		const answer = await this.#save(sent, this.version);
		if (answer.ok) {
			this.version = answer.version;
			this.message = null;
			this.state = this.doc === sent ? 'saved' : 'unsaved';
			if (this.state === 'unsaved') this.#timer = setTimeout(() => void this.flush(), this.#delay);
		} else if ('conflict' in answer) {
			this.newest = answer.conflict;
			this.state = 'conflict';
		} else {
			this.message = answer.message;
			this.state = 'failed';
		}
	}

	/** After a conflict: drop my changes and continue from the newest version. */
	takeNewest() {
		if (!this.newest) return;
		this.#past = [...this.#past, this.doc];
		this.doc = copy(this.newest.document);
		this.version = this.newest.version;
		this.newest = null;
		this.problems = [];
		this.state = 'saved';
	}

	/** After a conflict: save my document on top of the newest version, knowingly. */
	async keepMine() {
		if (!this.newest) return;
		this.version = this.newest.version;
		this.newest = null;
		this.state = 'unsaved';
		await this.flush();
	}

	retry() {
		if (this.state === 'failed') {
			this.state = 'unsaved';
			void this.flush();
		}
	}
}
