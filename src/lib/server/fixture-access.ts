import type { Role } from './db/schema';
import { ForbiddenError } from './errors';
import { ELECTRICIAN_FIELDS } from '../schemas/fixture';

/**
 * Electricians set a fixture's on-set state and notes only (DESIGN "Roles"); anything else in
 * the body refuses the whole request (403, checked before validation so an electrician hears
 * "not yours to change" rather than "bad input") before a row is read, so nothing is written.
 */
export function checkFixtureFields(role: Role, bodies: unknown[]): void {
	if (role !== 'electrician') return;
	const extra = new Set<string>();
	for (const b of bodies)
		for (const k of typeof b === 'object' && b !== null ? Object.keys(b) : [])
			if (k !== 'id' && !ELECTRICIAN_FIELDS.includes(k)) extra.add(k);
	if (extra.size > 0) {
		throw new ForbiddenError(`Electricians may change state and notes only, not ${[...extra].join(', ')}.`);
	}
}
