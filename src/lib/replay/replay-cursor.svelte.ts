// The replay cursor: where in the session we are, and the transport that moves it — play at a
// chosen speed in real time, pause, seek, and step from one event's landing time to the next.
// The frame source is injectable so tests drive time by hand.

export const SPEEDS = [0.25, 0.5, 1, 1.5, 2, 4] as const;

export interface Ticker {
	now(): number;
	frame(callback: () => void): number;
	cancel(id: number): void;
}

/** Index of the first time greater than `t` in ascending `times`. */
function firstAfter(times: readonly number[], t: number): number {
	let lo = 0;
	let hi = times.length;
	while (lo < hi) {
		const mid = (lo + hi) >> 1;
		if (times[mid] <= t) lo = mid + 1;
		else hi = mid;
	}
	return lo;
}

const browserTicker: Ticker = {
	now: () => performance.now(),
	frame: (callback) => requestAnimationFrame(callback),
	cancel: (id) => cancelAnimationFrame(id)
};

export class ReplayCursor {
	t = $state(0);
	playing = $state(false);
	speed = $state(1);
	duration = $state(0);
	#times: readonly number[] = [];
	#frame = 0;
	#last = 0;

	constructor(
		times: readonly number[],
		duration: number,
		start = 0,
		private readonly ticker: Ticker = browserTicker
	) {
		this.setTrack(times, duration);
		this.seek(start);
	}

	/** Landing times of the events (ascending) and the length of the plot, e.g. for another mapping. */
	setTrack(times: readonly number[], duration: number): void {
		this.#times = times;
		this.duration = duration;
		if (this.t > duration) this.seek(duration);
	}

	seek(ms: number): void {
		this.t = Math.min(Math.max(Number.isFinite(ms) ? ms : 0, 0), this.duration);
	}

	play(): void {
		// A session with no events has nothing to play: it does not run an empty clock.
		if (this.playing || this.duration === 0) return;
		if (this.t >= this.duration) this.t = 0;
		this.playing = true;
		this.#last = this.ticker.now();
		this.#frame = this.ticker.frame(this.#tick);
	}

	pause(): void {
		this.playing = false;
		this.ticker.cancel(this.#frame);
	}

	toggle(): void {
		if (this.playing) this.pause();
		else this.play();
	}

	setSpeed(speed: number): void {
		this.speed = SPEEDS.reduce((best, s) => (Math.abs(s - speed) < Math.abs(best - speed) ? s : best), 1);
	}

	/** To the next event landing after the cursor (or the end). */
	stepForward(): void {
		const next = this.#times[firstAfter(this.#times, this.t)];
		this.seek(next ?? this.duration);
	}

	/** To the latest event landing before the cursor (or the start). */
	stepBack(): void {
		let k = firstAfter(this.#times, this.t) - 1;
		while (k >= 0 && this.#times[k] >= this.t) k--;
		this.seek(k >= 0 ? this.#times[k] : 0);
	}

	#tick = () => {
		if (!this.playing) return;
		const now = this.ticker.now();
		const t = this.t + (now - this.#last) * this.speed;
		this.#last = now;
		if (t >= this.duration) {
			this.t = this.duration;
			this.pause();
			return;
		}
		this.t = t;
		this.#frame = this.ticker.frame(this.#tick);
	};

	dispose(): void {
		this.pause();
	}
}
