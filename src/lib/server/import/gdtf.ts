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
	return PARAMETER[attribute.toLowerCase()] ?? attribute;
}

/** "32768/2": a value at a byte count; rescaled to `bytes` by shifting whole bytes (GDTF DMXValue). Plain numbers are read at the channel's own resolution. */
export function parseDmxValue(text: string | undefined, bytes: number): number | null {
	if (text === undefined || text.trim() === '' || text.trim().toLowerCase() === 'none') return null;
	const m = /^\s*(\d+)\s*(?:\/\s*(\d+))?\s*$/.exec(text);
	if (!m) return null;
	const value = Number(m[1]);
	const from = m[2] === undefined ? bytes : Number(m[2]);
	if (from < 1 || from > 4) return null;
	const shift = 8 * (bytes - from);
	const v = shift >= 0 ? value * 2 ** shift : Math.floor(value / 2 ** -shift);
	return Math.min(v, 2 ** (8 * bytes) - 1);
}

const parser = new XMLParser({
	ignoreAttributes: false,
	attributeNamePrefix: '@_',
	parseAttributeValue: false,
	parseTagValue: false,
	processEntities: false,
	htmlEntities: false,
	ignoreDeclaration: true,
	ignorePiTags: true,
	isArray: (name) => ['DMXMode', 'DMXChannel', 'LogicalChannel', 'ChannelFunction'].includes(name)
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

function channelOf(ch: Node, modeName: string, warnings: string[]): (ChannelInput & { attribute: string }) | null {
	const offsets = (attr(ch, 'Offset') ?? '')
		.split(',')
		.map((s) => s.trim())
		.filter((s) => s !== '' && s.toLowerCase() !== 'none');
	const logical = list(ch, 'LogicalChannel')[0];
	const attribute = attr(logical, 'Attribute')?.split('.').pop()?.trim() || attr(ch, 'Name') || 'control';
	if (offsets.length > 3) {
		warnings.push(
			`Mode "${modeName}": ${attribute} uses ${offsets.length} bytes; only 8, 16 and 24 bits are kept, so it was left out.`
		);
		return null;
	}
	const nums = offsets.map(Number);
	if (nums.some((n) => !Number.isInteger(n) || n < 1 || n > 512)) {
		refuse(`Mode "${modeName}": channel ${attribute} has offset "${attr(ch, 'Offset')}", not slots 1–512.`);
	}
	const bytes = Math.max(1, nums.length);
	const bits = (bytes * 8) as 8 | 16 | 24;
	const functions = list(logical, 'ChannelFunction');
	// 1.0 keeps the default on the channel; 1.1+ on the channel function the InitialFunction names
	const initialName = attr(ch, 'InitialFunction')?.split('.').pop();
	const initial = functions.find((f) => initialName !== undefined && attr(f, 'Name') === initialName) ?? functions[0];
	const def = parseDmxValue(attr(ch, 'Default'), bytes) ?? parseDmxValue(attr(initial, 'Default'), bytes) ?? 0;
	const parameter = parameterFor(attribute);
	const out: ChannelInput & { attribute: string } = {
		offset: nums.length ? nums[0] : null,
		parameter,
		bits,
		default: def,
		attribute
	};
	if (parameter === 'cct' || parameter === 'hue') {
		const ranged = functions.find((f) => {
			const a = Number(attr(f, 'PhysicalFrom'));
			const b = Number(attr(f, 'PhysicalTo'));
			return (
				Number.isFinite(a) &&
				Number.isFinite(b) &&
				a !== b &&
				(parameter === 'hue' || (Math.min(a, b) >= 1000 && Math.max(a, b) <= 20000))
			);
		});
		if (ranged) {
			const a = Number(attr(ranged, 'PhysicalFrom'));
			const b = Number(attr(ranged, 'PhysicalTo'));
			out.min = Math.min(a, b);
			out.max = Math.max(a, b);
			out.unit = parameter === 'cct' ? 'K' : '°';
		}
	}
	if (nums.length > 1 && nums.some((n, i) => i > 0 && n !== nums[i - 1] + 1)) {
		warnings.push(
			`Mode "${modeName}": ${attribute} has non-adjacent bytes (${nums.join(',')}); kept as ${bits}-bit from slot ${nums[0]}.`
		);
	}
	return out;
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
	const modes: ModeInput[] = list(child(ft, 'DMXModes'), 'DMXMode').map((m, i) => {
		const name = attr(m, 'Name')?.trim() || `Mode ${i + 1}`;
		const channels: ChannelInput[] = [];
		for (const ch of list(child(m, 'DMXChannels'), 'DMXChannel')) {
			const brk = attr(ch, 'DMXBreak');
			if (brk !== undefined && brk !== '1' && brk.toLowerCase() !== 'overwrite') {
				warnings.push(`Mode "${name}": a channel on DMX break ${brk} needs its own address; left out.`);
				continue;
			}
			const c = channelOf(ch, name, warnings);
			if (c) {
				const { attribute, ...rest } = c;
				void attribute;
				channels.push(rest);
			}
		}
		suffixDuplicates(channels);
		return { name, channels };
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
