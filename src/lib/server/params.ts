import type { RequestEvent } from '@sveltejs/kit';
import { NotFoundError } from './errors';
import { parseId } from './authz';
import { InvalidError } from './errors';

/** A route's numeric id; anything else is simply not found. */
export function idParam(value: string | undefined, what: string): number {
	const id = parseId(value);
	if (id === null) throw new NotFoundError(`No such ${what} in this project.`);
	return id;
}

/** `?detach=true` on the deletes that can set dependent fixtures to manual instead of refusing. */
export function detachParam(event: Pick<RequestEvent, 'url'>): boolean {
	const v = event.url.searchParams.get('detach');
	return v === 'true' || v === '1';
}

/** `?version=N` on a delete: refused as stale when the row has moved on; absent, the delete is unconditional. */
export function versionParam(event: Pick<RequestEvent, 'url'>): number | null {
	const v = event.url.searchParams.get('version');
	if (v === null) return null;
	const n = parseId(v);
	if (n === null)
		throw new InvalidError('version is a positive whole number.', [
			{ path: ['version'], message: 'version is a positive whole number.' }
		]);
	return n;
}
