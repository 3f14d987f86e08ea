// The bitcrush processor runs in the audio thread: sample-and-hold to a lower rate, then
// quantize to fewer bits. Registered once per context from a Blob URL (no extra file to serve).
import type { BaseContext } from 'tone';

export const CRUSHER = 'padproof-crusher';

const PROCESSOR = `
class PadproofCrusher extends AudioWorkletProcessor {
	static get parameterDescriptors() {
		return [
			{ name: 'bits', defaultValue: 16, minValue: 1, maxValue: 16, automationRate: 'k-rate' },
			{ name: 'rate', defaultValue: 48000, minValue: 50, maxValue: 384000, automationRate: 'k-rate' }
		];
	}
	constructor() {
		super();
		this.phase = 1;
		this.held = [0, 0];
	}
	process(inputs, outputs, parameters) {
		const input = inputs[0];
		const output = outputs[0];
		const step = Math.pow(0.5, parameters.bits[0] - 1);
		const advance = Math.min(1, parameters.rate[0] / sampleRate);
		// Channel by channel, each from the same phase: locals in the inner loop run about twice
		// as fast as fields and nested arrays.
		let phase = this.phase;
		for (let c = 0; c < output.length; c++) {
			const source = input[c] || input[0];
			const out = output[c];
			let held = this.held[c];
			phase = this.phase;
			for (let i = 0; i < out.length; i++) {
				phase += advance;
				if (phase >= 1) {
					phase -= 1;
					held = source ? Math.round(source[i] / step) * step : 0;
				}
				out[i] = held;
			}
			this.held[c] = held;
		}
		this.phase = phase;
		return true;
	}
}
registerProcessor('${CRUSHER}', PadproofCrusher);
`;

const loaded = new WeakMap<object, Promise<boolean>>();
const ready = new WeakSet<object>();

/** Loads the processor into `context`; resolves false where worklets are unavailable. */
export function loadCrusher(context: BaseContext): Promise<boolean> {
	const raw = context.rawContext as object;
	let promise = loaded.get(raw);
	if (!promise) {
		const url = URL.createObjectURL(new Blob([PROCESSOR], { type: 'text/javascript' }));
		promise = context
			.addAudioWorkletModule(url)
			.then(() => (ready.add(raw), true))
			.catch(() => false);
		loaded.set(raw, promise);
	}
	return promise;
}

export function crusherReady(context: BaseContext): boolean {
	return ready.has(context.rawContext as object);
}
