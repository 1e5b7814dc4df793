// See https://svelte.dev/docs/kit/types#app.d.ts
declare global {
	namespace App {
		interface Error {
			message: string;
			code?: string;
		}
		interface Locals {
			/** The signed-in user, read once per request in hooks.server.ts. */
			user: { id: string; email: string; name: string | null } | null;
			/**
			 * GET and HEAD with a session: the database change state the session was checked at
			 * (db/change-state.ts). Reads kept per state — the role check, the cached JSON, kept pages —
			 * answer as of it. Unset for writes, whose loads and checks read afresh.
			 */
			readState?: string;
		}
		// interface PageData {}
		// interface PageState {}
		// interface Platform {}
	}
}

export {};
