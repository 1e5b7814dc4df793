import { error, type RequestEvent } from '@sveltejs/kit';
import { memberRole, memberRoleAt } from './db/members';
import type { Role } from './db/schema';

// The one authorization helper. Every server load, form action and
// +server.ts calls it; a layout's check does not cover actions or API routes.

const RANK: Record<Role, number> = { viewer: 1, electrician: 2, programmer: 3, owner: 4 };

export function roleAtLeast(role: Role, minimum: Role): boolean {
	return RANK[role] >= RANK[minimum];
}

export interface Access {
	user: NonNullable<App.Locals['user']>;
	projectId: number;
	role: Role;
}

export function requireUser(event: Pick<RequestEvent, 'locals'>): NonNullable<App.Locals['user']> {
	const user = event.locals.user;
	if (!user) error(401, { message: 'Sign in first.', code: 'unauthenticated' });
	return user;
}

export function parseId(value: string | number | undefined): number | null {
	const n = typeof value === 'number' ? value : Number(value);
	return Number.isSafeInteger(n) && n > 0 && String(n) === String(value).trim() ? n : null;
}

/**
 * 401 when nobody is signed in; 404 when the project does not exist or the
 * caller is not a member (never reveal that another project exists); 403 when
 * the member's role is below `minimum`.
 */
export function requireRole(
	event: Pick<RequestEvent, 'locals'>,
	projectId: string | number | undefined,
	minimum: Role
): Access {
	const user = requireUser(event);
	const id = parseId(projectId);
	const notFound = () => error(404, { message: 'No such project.', code: 'not-found' });
	if (id === null) notFound();
	const state = event.locals.readState;
	const role = state ? memberRoleAt(state, id!, user.id) : memberRole(id!, user.id);
	if (!role) notFound();
	if (!roleAtLeast(role!, minimum)) {
		error(403, {
			message: `This needs the ${minimum} role or higher; you are ${role}.`,
			code: 'forbidden'
		});
	}
	return { user, projectId: id!, role: role! };
}
