import type { RequestEvent } from '@sveltejs/kit';
import { NotFoundError } from './errors';
import { parseId } from './authz';

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
