import { XMLParser } from 'fast-xml-parser';
import { UnprocessableError } from '../errors';
import { typeCreate, type ChannelInput, type ModeInput, type TypeCreate } from '../../schemas/type';
import { guardXml, safeUnzip } from './limits';

// GDTF (DIN SPEC 15800) fixture types, versions 1.0–1.2: description.xml →
// GDTF → FixtureType → DMXModes → DMXMode → DMXChannels → DMXChannel →
// LogicalChannel → ChannelFunction. Only what a patch needs is read: modes,
// their channels' offsets and resolution, parameter, default and physical range.

export interface ImportIssue {
	row: number | null;
	field: string;
	message: string;
}

export interface GdtfResult {
	type: TypeCreate;
	dataVersion: string | null;
	warnings: string[];
}

type Node = Record<string, unknown>;

const PARAMETER: Record<string, string> = {
	dimmer: 'intensity',
	hsb_hue: 'hue',
	hsb_saturation: 'saturation',
	ctc: 'cct',
	cto: 'cct',
	ctb: 'cct',
	coloradd_r: 'red',
	coloradd_g: 'green',
	coloradd_b: 'blue',
	coloradd_w: 'white',
	colorrgb_red: 'red',
	colorrgb_green: 'green',
	colorrgb_blue: 'blue',
	colorrgb_white: 'white',
	shutter1: 'strobe',
	strobefrequency: 'strobe',
	fans: 'fan',
	fan: 'fan',
	control1: 'control'
};

export function parameterFor(attribute: string): string {
	// own keys only: an attribute named "constructor" must not find Object's
	const key = attribute.toLowerCase();
	return Object.hasOwn(PARAMETER, key) ? PARAMETER[key] : attribute;
}

/**
 * A GDTF DMXValue ("Uint/n" or "Uint/ns", DIN SPEC 15800 attribute value types) at a channel of
 * `bytes` bytes. "n" is the byte count the value is written at. Without "s" the value is stretched
 * by byte mirroring (255/1 at 16 bits = 65535, the spec's own example); with "s" whole bytes are
 * shifted (255/1s at 16 bits = 65280). Mirroring repeats the written bytes, most significant first
 * (128/1 at 16 bits = 0x8080) — the repeat rule beyond the spec's 255 example is from memory.
 * A plain number is read at the channel's own resolution. Narrowing keeps the high bytes.
 */
export function parseDmxValue(text: string | undefined, bytes: number): number | null {
	if (text === undefined || text.trim() === '' || text.trim().toLowerCase() === 'none') return null;
	const m = /^\s*(\d+)\s*(?:\/\s*(\d+)\s*(s?))?\s*$/i.exec(text);
	if (!m) return null;
	const value = Number(m[1]);
	const from = m[2] === undefined ? bytes : Number(m[2]);
	if (from < 1 || from > 6 || value > 2 ** (8 * from) - 1) return null;
	if (from >= bytes) return Math.floor(value / 2 ** (8 * (from - bytes)));
	if (m[3] !== undefined && m[3] !== '') return value * 2 ** (8 * (bytes - from));
	// byte mirroring: the written bytes repeated until the channel's bytes are filled
	const written: number[] = [];
	for (let i = from - 1; i >= 0; i--) written.push(Math.floor(value / 2 ** (8 * i)) % 256);
	let out = 0;
	for (let i = 0; i < bytes; i++) out = out * 256 + written[i % from];
	return out;
}

// Every geometry element type of DIN SPEC 15800 "Geometry collect"; each can hold further geometries.
const GEOMETRY_TAGS = [
	'Geometry',
	'Axis',
	'FilterBeam',
	'FilterColor',
	'FilterGobo',
	'FilterShaper',
	'Beam',
	'MediaServerLayer',
	'MediaServerCamera',
	'MediaServerMaster',
	'Display',
	'Laser',
	'WiringObject',
	'Inventory',
	'Structure',
	'Support',
	'Magnet'
];

const parser = new XMLParser({
	ignoreAttributes: false,
	attributeNamePrefix: '@_',
	parseAttributeValue: false,
	parseTagValue: false,
	processEntities: false,
	htmlEntities: false,
	ignoreDeclaration: true,
	ignorePiTags: true,
	isArray: (name) =>
		['DMXMode', 'DMXChannel', 'LogicalChannel', 'ChannelFunction', 'GeometryReference', 'Break'].includes(name) ||
		GEOMETRY_TAGS.includes(name)
});

function list(n: unknown, key: string): Node[] {
	const v = (n as Node | undefined)?.[key];
	return Array.isArray(v) ? (v as Node[]) : [];
}
function child(n: unknown, key: string): Node | undefined {
	const v = (n as Node | undefined)?.[key];
	return v && typeof v === 'object' && !Array.isArray(v) ? (v as Node) : undefined;
}
function attr(n: Node | undefined, key: string): string | undefined {
	const v = n?.[`@_${key}`];
	return typeof v === 'string' ? v : undefined;
}

function refuse(message: string, issues: ImportIssue[] = []): never {
	throw new UnprocessableError(message, issues.length ? issues : [{ row: null, field: 'file', message }], {
		code: 'invalid-file'
	});
}

/** Reads description.xml out of a .gdtf archive (every entry name checked, inflation capped). */
export function readGdtfArchive(bytes: Uint8Array): string {
	const files = safeUnzip(bytes, (name) => name === 'description.xml');
	const xml = files.get('description.xml');
	if (!xml) refuse('The archive has no description.xml; it is not a GDTF file.');
	let text: string;
	try {
		text = new TextDecoder('utf-8', { fatal: true }).decode(xml);
	} catch {
		refuse('description.xml is not UTF-8 text.');
	}
	return text;
}

// ---- geometry tree (DIN SPEC 15800 "Geometries", "Geometry Reference") ----

interface Reference {
	name: string;
	/** The top-level geometry it repeats. */
	geometry: string;
	/** Break children in document order: the DMX offset of each DMX break of the referenced geometry. */
	breaks: { dmxBreak: number; dmxOffset: number }[];
}

interface Tree {
	/** Geometry names inside the tree, references excluded. */
	names: Set<string>;
	/** GeometryReferences inside the tree, in document order per parent. */
	references: Reference[];
}

function geometryChildren(n: Node): Node[] {
	return GEOMETRY_TAGS.flatMap((tag) => list(n, tag));
}

// Depth cap: the XML parser bounds nesting too, but a walk should never trust its input.
const MAX_DEPTH = 64;

function walk(n: Node, into: Tree, depth = 0): void {
	const name = attr(n, 'Name');
	if (name !== undefined) into.names.add(name);
	if (depth > MAX_DEPTH) return;
	for (const r of list(n, 'GeometryReference')) {
		into.references.push({
			name: attr(r, 'Name') ?? '',
			geometry: attr(r, 'Geometry') ?? '',
			breaks: list(r, 'Break').map((b) => ({
				// Break: DMXBreak default 1, DMXOffset default 1 (no offset)
				dmxBreak: Number(attr(b, 'DMXBreak') ?? '1'),
				dmxOffset: Number(attr(b, 'DMXOffset') ?? '1')
			}))
		});
	}
	for (const c of geometryChildren(n)) walk(c, into, depth + 1);
}

function treeOf(n: Node): Tree {
	const t: Tree = { names: new Set(), references: [] };
	walk(n, t);
	return t;
}

// ---- channels ----

type Channel = ChannelInput & { attribute: string };

function parseOffsets(text: string | undefined): number[] | 'bad' {
	const parts = (text ?? '')
		.split(',')
		.map((s) => s.trim())
		.filter((s) => s !== '' && s.toLowerCase() !== 'none');
	const nums = parts.map(Number);
	return nums.some((n) => !Number.isInteger(n) || n < 1) ? 'bad' : nums;
}

/** Offsets (most significant first) → the channel's offset and, when not adjacent, its finer bytes. */
function placeOffsets(out: Channel, offsets: number[]): void {
	out.offset = offsets.length ? offsets[0] : null;
	const adjacent = offsets.every((o, i) => i === 0 || o === offsets[0] + i);
	if (offsets.length > 1 && !adjacent) out.fineOffsets = offsets.slice(1);
	else delete out.fineOffsets;
}

function channelOf(ch: Node, attribute: string, offsets: number[]): Channel {
	const logical = list(ch, 'LogicalChannel')[0];
	const bytes = Math.max(1, offsets.length);
	const bits = (bytes * 8) as 8 | 16 | 24 | 32;
	const functions = list(logical, 'ChannelFunction');
	// 1.0 keeps the default on the channel; 1.1+ on the channel function the InitialFunction names
	const initialName = attr(ch, 'InitialFunction')?.split('.').pop();
	const initial = functions.find((f) => initialName !== undefined && attr(f, 'Name') === initialName) ?? functions[0];
	const def = parseDmxValue(attr(ch, 'Default'), bytes) ?? parseDmxValue(attr(initial, 'Default'), bytes) ?? 0;
	const parameter = parameterFor(attribute);
	const out: Channel = { offset: null, parameter, bits, default: def, attribute };
	placeOffsets(out, offsets);
	if (parameter === 'cct' || parameter === 'hue') rangeOf(out, functions, bytes);
	return out;
}

/**
 * The physical range of the first channel function that has one, kept in its direction
 * (PhysicalFrom at DMXFrom, PhysicalTo at the function's last value) and with its DMX sub-range:
 * a function runs from its DMXFrom to one below the next function's DMXFrom, the last one to the
 * channel's top value (DIN SPEC 15800 "Channel Function").
 */
function rangeOf(out: Channel, functions: Node[], bytes: number): void {
	const top = 2 ** (8 * bytes) - 1;
	const starts = functions.map((f) => parseDmxValue(attr(f, 'DMXFrom'), bytes) ?? 0);
	const i = functions.findIndex((f) => {
		const a = Number(attr(f, 'PhysicalFrom'));
		const b = Number(attr(f, 'PhysicalTo'));
		return (
			Number.isFinite(a) &&
			Number.isFinite(b) &&
			a !== b &&
			(out.parameter === 'hue' || (Math.min(a, b) >= 1000 && Math.max(a, b) <= 20000))
		);
	});
	if (i < 0) return;
	out.min = Number(attr(functions[i], 'PhysicalFrom'));
	out.max = Number(attr(functions[i], 'PhysicalTo'));
	out.unit = out.parameter === 'cct' ? 'K' : '°';
	const from = starts[i];
	const later = starts.filter((s) => s > from);
	const to = later.length ? Math.min(...later) - 1 : top;
	if (from !== 0 || to !== top) {
		out.dmxFrom = from;
		out.dmxTo = to;
	}
}

/** Multi-instance geometries repeat an attribute: intensity, intensity 2, intensity 3 … */
function suffixDuplicates(channels: ChannelInput[]): void {
	const seen = new Map<string, number>();
	for (const c of channels) {
		const n = (seen.get(c.parameter) ?? 0) + 1;
		seen.set(c.parameter, n);
		if (n > 1) c.parameter = `${c.parameter} ${n}`;
	}
}

const MAX_BYTES = 4;

/**
 * One DMX mode → its channels. A channel on a geometry of the mode's own tree is read as written. A
 * channel on a geometry that GeometryReferences repeat is read once per reference, moved by the
 * reference's Break: the Break with the channel's DMXBreak gives the DMXOffset; a channel with
 * DMXBreak="Overwrite" takes break and offset from the reference's last Break (DIN SPEC 15800
 * "DMX Channel" DMXBreak, "Geometry Reference" Break).
 */
function modeChannels(m: Node, modeName: string, topLevel: Map<string, Tree>, skipped: string[]): ChannelInput[] {
	const root = topLevel.get(attr(m, 'Geometry') ?? '');
	// Which top-level geometry each geometry name belongs to, for the referenced ones.
	const referenced = new Map<string, Reference[]>();
	for (const r of root?.references ?? []) {
		const refs = referenced.get(r.geometry) ?? [];
		refs.push(r);
		referenced.set(r.geometry, refs);
	}
	const ownerOf = (geometry: string): string | undefined => {
		for (const top of referenced.keys()) if (topLevel.get(top)?.names.has(geometry)) return top;
		return undefined;
	};
	const channels: ChannelInput[] = [];
	const push = (c: Channel): void => {
		const { attribute, ...rest } = c;
		void attribute;
		channels.push(rest);
	};
	for (const ch of list(child(m, 'DMXChannels'), 'DMXChannel')) {
		const logical = list(ch, 'LogicalChannel')[0];
		const attribute = attr(logical, 'Attribute')?.split('.').pop()?.trim() || attr(ch, 'Name') || 'control';
		const geometry = attr(ch, 'Geometry') ?? '';
		const what = `Mode "${modeName}": ${attribute}${geometry ? ` (geometry ${geometry})` : ''}`;
		const offsets = parseOffsets(attr(ch, 'Offset'));
		if (offsets === 'bad') {
			refuse(`${what} has offset "${attr(ch, 'Offset')}", not slots from 1.`);
		}
		if (offsets.length > MAX_BYTES) {
			skipped.push(`${what} uses ${offsets.length} bytes; up to ${MAX_BYTES} (32 bits) are kept, so it was left out.`);
			continue;
		}
		const brkText = (attr(ch, 'DMXBreak') ?? '1').trim();
		const overwrite = brkText.toLowerCase() === 'overwrite';
		const brk = overwrite ? 1 : Number(brkText);
		if (!overwrite && (!Number.isInteger(brk) || brk < 1)) {
			skipped.push(`${what} has DMX break "${brkText}", not a number from 1; left out.`);
			continue;
		}
		const base = channelOf(ch, attribute, offsets);
		const top = root?.names.has(geometry) ? undefined : ownerOf(geometry);
		if (top === undefined) {
			if (overwrite) {
				skipped.push(`${what} has DMXBreak="Overwrite" but no geometry reference repeats its geometry; left out.`);
				continue;
			}
			if (brk !== 1) base.dmxBreak = brk;
			if (offsets.some((o) => o > 512)) {
				skipped.push(`${what} has offset ${offsets.join(',')}, past slot 512; left out.`);
				continue;
			}
			push(base);
			continue;
		}
		for (const ref of referenced.get(top) ?? []) {
			const b = overwrite ? ref.breaks[ref.breaks.length - 1] : ref.breaks.find((x) => x.dmxBreak === brk);
			if (b === undefined || !Number.isInteger(b.dmxOffset) || !Number.isInteger(b.dmxBreak) || b.dmxBreak < 1) {
				skipped.push(`${what} in reference ${ref.name}: the reference has no Break for DMX break ${brk}; left out.`);
				continue;
			}
			const moved = offsets.map((o) => o + b.dmxOffset - 1);
			if (moved.some((o) => o > 512 || o < 1)) {
				skipped.push(`${what} in reference ${ref.name} lands on slot ${moved.join(',')}, outside 1–512; left out.`);
				continue;
			}
			const c: Channel = { ...base };
			placeOffsets(c, moved);
			if (b.dmxBreak !== 1) c.dmxBreak = b.dmxBreak;
			else delete c.dmxBreak;
			push(c);
		}
	}
	suffixDuplicates(channels);
	return channels;
}

/** description.xml text → a fixture type body, validated by the same schema the API uses. */
export function parseGdtfXml(xml: string): GdtfResult {
	guardXml(xml);
	let doc: Node;
	try {
		doc = parser.parse(xml, true) as Node;
	} catch (e) {
		refuse(`description.xml is not well-formed XML: ${(e as Error).message.slice(0, 200)}`);
	}
	const root = child(doc, 'GDTF');
	const ft = child(root, 'FixtureType');
	if (!ft) refuse('description.xml has no GDTF → FixtureType element.');
	const warnings: string[] = [];
	const dataVersion = attr(root, 'DataVersion') ?? null;
	if (dataVersion && !/^1\.[0-2]$/.test(dataVersion))
		warnings.push(`GDTF DataVersion ${dataVersion}: read as 1.2; check the result.`);
	const topLevel = new Map<string, Tree>();
	for (const g of geometryChildren(child(ft, 'Geometries') ?? {})) {
		const name = attr(g, 'Name');
		if (name !== undefined) topLevel.set(name, treeOf(g));
	}
	const modes: ModeInput[] = list(child(ft, 'DMXModes'), 'DMXMode').map((m, i) => {
		const name = attr(m, 'Name')?.trim() || `Mode ${i + 1}`;
		return { name, channels: modeChannels(m, name, topLevel, warnings) };
	});
	const name = attr(ft, 'Name')?.trim() ?? '';
	const description = attr(ft, 'Description')?.trim() ?? '';
	const body = {
		maker: attr(ft, 'Manufacturer')?.trim() ?? '',
		model: attr(ft, 'LongName')?.trim() || name,
		notes: [description, attr(ft, 'ShortName') ? `Short name: ${attr(ft, 'ShortName')}` : '', 'Imported from GDTF.']
			.filter(Boolean)
			.join('\n'),
		modes
	};
	const parsed = typeCreate.safeParse(body);
	if (!parsed.success) {
		const issues = parsed.error.issues.map((i) => ({
			row: null,
			field: i.path.map(String).join('.'),
			message: describePath(body, i.path) + i.message
		}));
		refuse(issues.length === 1 ? issues[0].message : `The fixture type has ${issues.length} problems.`, issues);
	}
	return { type: parsed.data, dataVersion, warnings };
}

function describePath(body: { modes: ModeInput[] }, path: PropertyKey[]): string {
	if (path[0] !== 'modes' || typeof path[1] !== 'number') return '';
	const mode = body.modes[path[1]];
	return mode ? `Mode "${mode.name}": ` : '';
}

export function parseGdtf(bytes: Uint8Array): GdtfResult {
	return parseGdtfXml(readGdtfArchive(bytes));
}
