// The part of autocannon 9's API that tests/load/load.ts uses (the package ships no types).
declare module 'autocannon' {
	interface Request {
		method?: string;
		path?: string;
		body?: string;
		headers?: Record<string, string>;
		setupRequest?: (req: Record<string, unknown>, context: never) => Record<string, unknown>;
		onResponse?: (status: number, body: string, context: never) => void;
	}
	interface Options {
		url: string;
		connections?: number;
		duration?: number;
		timeout?: number;
		headers?: Record<string, string>;
		requests?: Request[];
	}
	interface Histogram {
		average: number;
		p50: number;
		p99: number;
		max: number;
		total: number;
	}
	interface Result {
		requests: Histogram;
		latency: Histogram;
		errors: number;
		timeouts: number;
		'2xx': number;
		'4xx': number;
		'5xx': number;
		non2xx: number;
	}
	function autocannon(options: Options): Promise<Result> & { stop(): void };
	export default autocannon;
}
