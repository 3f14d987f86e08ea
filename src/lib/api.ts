// Calls to Padproof's JSON API from the browser, with the server's plain-language refusals
// turned into errors a page can show.
export class ApiError extends Error {
	constructor(
		readonly status: number,
		message: string,
		readonly problems: { path: string; message: string }[] = [],
		/** The whole refusal as the server sent it (a 409 on a mapping save carries `newest`). */
		readonly body: unknown = null
	) {
		super(message);
	}
}

export async function api<T>(
	path: string,
	init: RequestInit & { body?: BodyInit | null } = {},
	json?: unknown
): Promise<T> {
	let response: Response;
	try {
		response = await fetch(path, {
			...init,
			headers: json === undefined ? init.headers : { 'content-type': 'application/json', ...init.headers },
			body: json === undefined ? init.body : JSON.stringify(json)
		});
	} catch {
		throw new ApiError(0, 'Padproof’s server cannot be reached. Check the connection and try again.');
	}
	if (response.status === 204) return undefined as T;
	const body = await response.json().catch(() => null);
	if (!response.ok) {
		throw new ApiError(
			response.status,
			body?.error ?? `The server answered ${response.status}.`,
			body?.problems ?? [],
			body
		);
	}
	return body as T;
}
