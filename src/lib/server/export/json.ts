import { loadPatch } from '../db/patch';

// The whole project as one JSON document (a backup, or a move between
// servers). Ids are the exporting server's; an import maps them to new ones.

export const PROJECT_FORMAT = 'patchwright-project';
export const PROJECT_FORMAT_VERSION = 1;

export function exportProject(projectId: number) {
	const p = loadPatch(projectId);
	return {
		format: PROJECT_FORMAT,
		version: PROJECT_FORMAT_VERSION,
		exportedAt: new Date().toISOString(),
		project: {
			name: p.project.name,
			venue: p.project.venue,
			startsOn: p.project.startsOn,
			endsOn: p.project.endsOn,
			notes: p.project.notes,
			artnetOffset: p.project.artnetOffset
		},
		universes: p.universes.map((u) => ({
			id: u.id,
			number: u.number,
			name: u.name,
			transport: u.transport,
			notes: u.notes
		})),
		types: p.types.map((t) => ({
			id: t.id,
			maker: t.maker,
			model: t.model,
			notes: t.notes,
			modes: t.modes.map((m) => ({ id: m.id, name: m.name, channels: m.channels }))
		})),
		receivers: p.receivers.map((r) => ({
			id: r.id,
			name: r.name,
			protocol: r.protocol,
			transmitterNotes: r.transmitterNotes,
			labels: r.labels
		})),
		fixtures: p.fixtures.map((f) => ({
			id: f.id,
			number: f.number,
			label: f.label,
			typeId: f.typeId,
			modeId: f.modeId,
			position: f.position,
			group: f.group,
			linkGroup: f.linkGroup,
			colour: f.colour,
			watts: f.watts,
			notes: f.notes,
			state: f.state,
			look: f.look,
			control: f.control
		}))
	};
}

export type ProjectExport = ReturnType<typeof exportProject>;

// one slug for every download: see download-name.ts
export { downloadName } from '../download-name';
