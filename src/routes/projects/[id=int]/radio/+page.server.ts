import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/authz';
import type { PatchData } from '$lib/server/db/patch';
import type { PageServerLoad } from './$types';

// Receivers with, per channel, which parameter of which fixture it drives.
export const load: PageServerLoad = async (event) => {
	const { role } = requireRole(event, event.params.id, 'viewer');
	const res = await event.fetch(`/api/projects/${event.params.id}/patch`);
	if (!res.ok) error(res.status, 'The patch could not be loaded');
	const p = (await res.json()) as PatchData;
	const rc = p.fixtures.filter((f) => f.control.kind === 'rc');
	return {
		role,
		receivers: p.receivers.map((r) => ({
			...r,
			drives: rc.flatMap((f) =>
				f.control.kind === 'rc' && f.control.receiverId === r.id
					? Object.entries(f.control.channels).map(([parameter, channel]) => ({
							channel,
							parameter,
							fixtureId: f.id,
							number: f.number,
							label: f.label
						}))
					: []
			)
		})),
		unassigned: rc
			.filter((f) => f.control.kind === 'rc' && f.control.receiverId == null)
			.map((f) => ({ id: f.id, number: f.number, label: f.label })),
		conflicts: p.conflicts.filter((c) => c.kind === 'rc-collision' || c.kind === 'rc-unassigned')
	};
};
