import { describe, expect, it } from 'vitest';
import { render, screen, within } from '@testing-library/svelte';
import TrashList from '$lib/components/trash/TrashList.svelte';
import Term from '$lib/components/ui/Term.svelte';
import { FINDING_KINDS } from '$lib/engine';
import { GLOSSARY, glossaryEntry } from '$lib/glossary';

describe('TrashList', () => {
	it('says what the trash is for when it is empty, with the way back', () => {
		render(TrashList, { items: [], days: 30 });
		const empty = screen.getByTestId('trash-empty');
		expect(empty).toHaveTextContent('wait here for 30 days');
		expect(within(empty).getByRole('link', { name: 'sessions' })).toHaveAttribute('href', '/sessions');
	});

	it('lists each item with its days left and a restore form naming it', () => {
		render(TrashList, {
			days: 30,
			items: [
				{
					kind: 'session',
					id: 's1',
					name: 'Friday take',
					detail: 'session · Broken stutter row · 4 events',
					deletedAt: new Date('2026-12-01T10:00:00Z'),
					daysLeft: 29
				},
				{
					kind: 'mapping',
					id: 'm1',
					name: 'Kai row',
					detail: 'mapping · v2',
					deletedAt: new Date('2026-11-03T10:00:00Z'),
					daysLeft: 1
				}
			]
		});
		const rows = screen.getAllByTestId('trash-item');
		expect(rows.map((r) => r.dataset.kind)).toEqual(['session', 'mapping']);
		expect(within(rows[0]).getByTestId('trash-days-left')).toHaveTextContent('29 days left');
		expect(within(rows[1]).getByTestId('trash-days-left')).toHaveTextContent('1 day left');
		const restore = within(rows[1]).getByRole('button', { name: 'Restore Kai row' });
		const form = restore.closest('form')!;
		expect(form).toHaveAttribute('action', '?/restore');
		expect(Object.fromEntries(new FormData(form))).toEqual({ kind: 'mapping', id: 'm1' });
	});
});

describe('Term', () => {
	it('links a term to its glossary entry and carries its one line', () => {
		render(Term, { term: 'hold group' });
		const link = screen.getByRole('link', { name: 'hold group' });
		expect(link).toHaveAttribute('href', '/help#hold-group');
		const line = glossaryEntry('hold-group')!.line;
		expect(screen.getByRole('tooltip', { hidden: true })).toHaveTextContent(line);
		expect(link).toHaveAccessibleDescription(line);
	});

	it('shows an unknown term as plain text, without a dead link', () => {
		render(Term, { term: 'no such word' });
		expect(screen.queryByRole('link')).toBeNull();
		expect(document.body).toHaveTextContent('no such word');
	});
});

describe('the glossary', () => {
	it.each([
		'mapping',
		'controller-profile',
		'binding',
		'step',
		'action',
		'phase',
		'guard',
		'counter',
		'rig',
		'deck',
		'rack',
		'chain',
		'hold-group',
		'intent',
		'session',
		'drill',
		'assignment',
		'submission',
		'dropout',
		'stuck-on',
		'bleed',
		'clash',
		'count-left-over',
		'count-overflow',
		'takeover',
		'midi',
		'cc',
		'velocity',
		'quantize',
		'dry-wet'
	])('explains “%s” in one line', (id) => {
		const entry = glossaryEntry(id);
		expect(entry?.line).toMatch(/^[A-Z].{20,160}[.]$/);
	});

	it('explains every kind of finding the engine reports', () => {
		expect(FINDING_KINDS.filter((kind) => !glossaryEntry(kind))).toEqual([]);
	});

	it('has one entry per anchor', () => {
		expect(new Set(GLOSSARY.map((e) => e.id)).size).toBe(GLOSSARY.length);
	});
});
