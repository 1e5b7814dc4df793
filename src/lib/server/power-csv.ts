import type { Feed } from '../patch/index';

// The CSV "feed" cell (issue 15): "battery: <pack type>", "mains: <circuit>" or "none".
// Export writes it, import reads it back; names match without regard to case.

export interface FeedNames {
	packTypes: { id: number; name: string }[];
	circuits: { id: number; name: string }[];
}

export function feedText(feed: Feed | undefined, names: FeedNames): string {
	if (!feed || feed.kind === 'none') return 'none';
	if (feed.kind === 'battery') return `battery: ${names.packTypes.find((p) => p.id === feed.packTypeId)?.name ?? '?'}`;
	return `mains: ${names.circuits.find((c) => c.id === feed.circuitId)?.name ?? '?'}`;
}

export function parseFeed(text: string, names: FeedNames): { feed: Feed } | { error: string } {
	const t = text.trim();
	if (/^(none|-)$/i.test(t)) return { feed: { kind: 'none' } };
	const m = /^(battery|mains)\s*:\s*(.+)$/i.exec(t);
	if (!m) return { error: `"${t}" is not a feed: write "battery: <pack type>", "mains: <circuit>" or "none".` };
	const name = m[2]!.trim().toLowerCase();
	if (m[1]!.toLowerCase() === 'battery') {
		const p = names.packTypes.find((x) => x.name.toLowerCase() === name);
		return p
			? { feed: { kind: 'battery', packTypeId: p.id } }
			: { error: `No pack type "${m[2]!.trim()}" in this project; add it on the Power page first.` };
	}
	const c = names.circuits.find((x) => x.name.toLowerCase() === name);
	return c
		? { feed: { kind: 'mains', circuitId: c.id } }
		: { error: `No circuit "${m[2]!.trim()}" in this project; add it on the Power page first.` };
}

export function sameFeed(a: Feed | undefined, b: Feed): boolean {
	return JSON.stringify(a ?? { kind: 'none' }) === JSON.stringify(b);
}
