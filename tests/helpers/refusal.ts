import { ApiError } from '../../src/lib/server/api';

/** The ApiError a call refuses with; fails the test when it does not refuse. */
export function refusal(fn: () => unknown): ApiError {
	try {
		fn();
	} catch (e) {
		if (e instanceof ApiError) return e;
		throw e;
	}
	throw new Error('expected a refusal');
}
