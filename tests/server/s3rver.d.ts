// The s3rver fake ships no types; the part the tests use.
declare module 's3rver' {
	export default class S3rver {
		constructor(options: {
			port?: number;
			address?: string;
			silent?: boolean;
			directory: string;
			configureBuckets?: { name: string }[];
		});
		run(): Promise<{ address: string; port: number }>;
		close(): Promise<void>;
	}
}
