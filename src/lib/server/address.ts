import { isIP } from 'node:net';
import { addressHeader } from './config';

/**
 * The client's address for throttling. The socket's peer address, unless `ADDRESS_HEADER` names a
 * header that a proxy in front of the app sets; then its right-most entry (the one that proxy
 * added — entries left of it come from the client and can be forged). IPv6 addresses are counted
 * per /64 network, since one household or school gets a whole /64 (common practice, RFC 6177).
 */
export function clientAddress(headers: Headers, socketAddress: () => string, header = addressHeader()): string {
	let address = '';
	if (header) address = headers.get(header)?.split(',').at(-1)?.trim() ?? '';
	if (!address) {
		try {
			address = socketAddress();
		} catch {
			address = '';
		}
	}
	return normalizeAddress(address);
}

export function normalizeAddress(raw: string): string {
	const address = raw.trim().toLowerCase();
	const mapped = address.match(/^::ffff:(\d+\.\d+\.\d+\.\d+)$/);
	if (mapped) return mapped[1];
	if (isIP(address) !== 6) return isIP(address) === 4 ? address : 'unknown';
	const [head, tail = ''] = address.split('::');
	const left = head ? head.split(':') : [];
	const right = tail ? tail.split(':') : [];
	const groups = address.includes('::')
		? [...left, ...Array(8 - left.length - right.length).fill('0'), ...right]
		: address.split(':');
	return `${groups
		.slice(0, 4)
		.map((g) => g.padStart(4, '0'))
		.join(':')}::/64`;
}
