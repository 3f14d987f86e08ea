// The sessions page's import names a wrong file as soon as it is chosen, before any mapping is
// picked; a right file still needs the mapping to replay it with, and is then sent as it is.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { render, screen } from '@testing-library/svelte';
import userEvent from '@testing-library/user-event';
import ImportSession from '$lib/components/sessions/ImportSession.svelte';
import { demoMapping } from '$lib/engine/demo';
import { sessionFromEvents } from '$lib/engine/session';

const mappings = [{ id: 'm1', name: 'Two-deck pad set' }];
const json = (name: string, value: unknown) => new File([JSON.stringify(value)], name, { type: 'application/json' });
const take = sessionFromEvents([{ t: 0, input: 'pad-1', type: 'press' }], 124);

afterEach(() => vi.unstubAllGlobals());

function setUp() {
	const fetch = vi.fn(async () => new Response(JSON.stringify({ id: 's1' }), { status: 201 }));
	vi.stubGlobal('fetch', fetch);
	const onImported = vi.fn();
	render(ImportSession, { mappings, onImported });
	const user = userEvent.setup();
	const choose = (file: File) => user.upload(screen.getByTestId('import-session'), file);
	const error = () => screen.queryByTestId('import-session-error');
	return { fetch, onImported, user, choose, error };
}

describe('ImportSession', () => {
	it('says a mapping file is a mapping file as soon as it is chosen, with no mapping picked', async () => {
		const { choose, error, fetch } = setUp();
		await choose(json('show.json', demoMapping('two-deck')));
		await vi.waitFor(() =>
			expect(error()).toHaveTextContent(
				'show.json is a mapping file, not a session. Import it on the Mappings page. Nothing was saved.'
			)
		);
		expect(fetch).not.toHaveBeenCalled();
	});

	it('names a damaged file at once too', async () => {
		const { choose, error } = setUp();
		await choose(new File(['{"events": ['], 'cut.json', { type: 'application/json' }));
		await vi.waitFor(() => expect(error()).toHaveTextContent('cut.json is a JSON file that is cut short or damaged'));
	});

	it('asks for the mapping when a session file is chosen first, then sends it once one is picked', async () => {
		const { choose, error, fetch, user, onImported } = setUp();
		await choose(json('friday.session.json', take));
		await vi.waitFor(() => expect(error()).toHaveTextContent('Choose the mapping to replay the session with first.'));
		expect(fetch).not.toHaveBeenCalled();

		await user.selectOptions(screen.getByTestId('import-session-mapping'), 'm1');
		await choose(json('friday.session.json', take));
		await vi.waitFor(() => expect(onImported).toHaveBeenCalledWith('s1'));
		expect(error()).toBeNull();
		const [path, init] = fetch.mock.calls[0] as unknown as [string, RequestInit];
		expect(path).toBe('/api/sessions');
		expect(JSON.parse(init.body as string)).toEqual({ mappingId: 'm1', name: 'friday', session: take });
	});
});
