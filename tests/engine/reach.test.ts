import { describe, expect, it } from 'vitest';
import { legatoRow, onePressEffect } from '$lib/engine/builders';
import { DEMO_MAPPINGS } from '$lib/engine/demo';
import { mappingReach } from '$lib/engine/reach';
import { runEvents } from '$lib/engine/replay';
import { CHAIN_MAX, DECK_IDS, type InputEvent } from '$lib/engine/types';
import { mappingWith } from './factories';

describe('mappingReach', () => {
	it('names the effect a one-press pad loads and only the deck it routes the rack to', () => {
		const m = mappingWith(
			[onePressEffect({ input: 'p1', rack: 2, effect: 'echo', params: [0.6], mix: 0.8, deck: 'B', decks: 4 })],
			{ decks: 4 }
		);
		const reach = mappingReach(m);
		expect(reach).toHaveLength(m.racks.length);
		expect(reach[1].effects[0]).toEqual(['echo']);
		expect(reach[1].effects.slice(1).every((p) => p.length === 0)).toBe(true);
		// The pad routes rack 2 away from A, C and D ("set 0"): it never brings the rack there.
		expect(reach[1].decks).toEqual(['B']);
		expect(reach[0]).toEqual({ effects: Array.from({ length: CHAIN_MAX }, () => []), decks: [] });
	});

	it('collects every effect a position may hold, once, from chains and single-effect steps', () => {
		const m = mappingWith([
			onePressEffect({ input: 'p1', rack: 1, effect: 'echo', mix: 0.5, deck: 'A', decks: 2 }),
			onePressEffect({ input: 'p2', rack: 1, effect: 'reverb', mix: 0.5, deck: 'A', decks: 2 }),
			onePressEffect({ input: 'p3', rack: 1, effect: 'echo', mix: 0.5, deck: 'B', decks: 2 }),
			{
				input: 'p4',
				steps: [{ target: { kind: 'effect', rack: 1, position: 3 }, action: 'set', value: 'phaser' }]
			}
		]);
		const [first] = mappingReach(m);
		expect(first.effects[0]).toEqual(['echo', 'reverb']);
		expect(first.effects[2]).toEqual(['phaser']);
		expect(first.decks).toEqual(['A', 'B']);
	});

	it('covers a hold-group row', () => {
		const row = legatoRow({
			pads: ['p1', 'p2', 'p3', 'p4'],
			rack: 3,
			effect: 'stutter',
			variants: ['1/4', '1/8', '1/16', '1/32'],
			counter: 'held',
			deck: 'A',
			decks: 2
		});
		const m = mappingWith(row.bindings, { counters: [row.counter] });
		expect(mappingReach(m)[2]).toMatchObject({ effects: [['stutter'], [], [], []], decks: ['A'] });
	});

	// The property the sound relies on: whatever a demo set is played with, every effect a
	// position holds and every deck a rack is routed to was named beforehand.
	it.each(DEMO_MAPPINGS.map((d) => [d.slug, d.mapping] as const))(
		'%s: every rig state reached by pressing its pads stays inside its reach',
		(_id, mapping) => {
			const reach = mappingReach(mapping);
			const inputs = mapping.bindings.map((b) => b.input);
			const events: InputEvent[] = [];
			let t = 0;
			// Each pad alone, then overlapping pairs in both orders.
			for (const a of inputs)
				events.push({ t: (t += 50), input: a, type: 'press' }, { t: (t += 50), input: a, type: 'release' });
			for (const a of inputs)
				for (const b of inputs)
					if (a !== b)
						events.push(
							{ t: (t += 50), input: a, type: 'press' },
							{ t: (t += 50), input: b, type: 'press' },
							{ t: (t += 50), input: a, type: 'release' },
							{ t: (t += 50), input: b, type: 'release' }
						);
			let checked = 0;
			runEvents(mapping, events, {}, (result) => {
				result.state.racks.forEach((rack, r) => {
					rack.chain.forEach((p, i) => p.effect && expect(reach[r].effects[i]).toContain(p.effect));
					for (const d of DECK_IDS) if (rack.routes[d]) expect(reach[r].decks).toContain(d);
				});
				checked++;
			});
			expect(checked).toBe(events.length);
		}
	);
});
