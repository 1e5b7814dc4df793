// Compares project exports across servers: ids differ, what they point at must not.

/** Replaces every id by what it points at, and drops the export time. */
export function normaliseExport(
	doc: Record<string, unknown> & {
		universes: { id: number; number: number }[];
		types: { id: number; modes: { id: number }[] }[];
		receivers: { id: number }[];
		fixtures: { id: number; number: number; typeId: number; modeId: number; control: Record<string, unknown> }[];
	}
) {
	const u = new Map(doc.universes.map((x, i) => [x.id, i]));
	const t = new Map(doc.types.map((x, i) => [x.id, i]));
	const m = new Map(doc.types.flatMap((x, i) => x.modes.map((mm, j) => [mm.id, `${i}.${j}`] as const)));
	const r = new Map(doc.receivers.map((x, i) => [x.id, i]));
	const f = new Map(doc.fixtures.map((x) => [x.id, x.number]));
	const { exportedAt, ...rest } = doc;
	if (typeof exportedAt !== 'string') throw new Error('exportedAt missing');
	// a restored copy is named "<name> (restored <date>)" (issue 16); the rest must be identical
	const project = rest.project as { name?: string } | undefined;
	return {
		...rest,
		...(project
			? { project: { ...project, name: project.name?.replace(/ \(restored \d{4}-\d{2}-\d{2}\)$/, '') } }
			: {}),
		universes: doc.universes.map((x) => ({ ...x, id: u.get(x.id) })),
		types: doc.types.map((x) => ({ ...x, id: t.get(x.id), modes: x.modes.map((mm) => ({ ...mm, id: m.get(mm.id) })) })),
		receivers: doc.receivers.map((x) => ({ ...x, id: r.get(x.id) })),
		fixtures: doc.fixtures.map((x) => {
			const c = { ...x.control };
			if ('universeId' in c) c.universeId = u.get(c.universeId as number);
			if ('receiverId' in c) c.receiverId = r.get(c.receiverId as number);
			if ('leaderId' in c) c.leaderId = f.get(c.leaderId as number);
			return { ...x, id: undefined, typeId: t.get(x.typeId), modeId: m.get(x.modeId), control: c };
		})
	};
}
