import { DomainError } from '../../src/lib/server/errors';

export interface Refusal {
	status: number;
	code: string;
	message: string;
	issues: unknown[] | undefined;
	/** what the JSON answer carries besides the message: `code`, `issues` and any extra members */
	extra: Record<string, unknown> & { code: string; issues?: unknown[] };
}

/** The domain error a call refuses with (src/lib/server/errors.ts); fails the test when it does not refuse. */
export function refusal(fn: () => unknown): Refusal {
	try {
		fn();
	} catch (e) {
		if (!(e instanceof DomainError)) throw e;
		const issues = e.issues();
		return {
			status: e.status,
			code: e.code,
			message: e.message,
			issues,
			extra: { ...e.extra(), code: e.code, ...(issues ? { issues } : {}) }
		};
	}
	throw new Error('expected a refusal');
}
