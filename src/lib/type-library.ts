import type { Bits, ModeChannel } from '$lib/patch';

// Generic starting points for a new fixture type: common channel layouts,
// no maker's names. The programmer edits them to match the unit's manual.

export type LibraryChannel = ModeChannel;
export interface LibraryType {
	key: string;
	maker: string;
	model: string;
	notes: string;
	modes: { name: string; channels: LibraryChannel[] }[];
}

const pct = { min: 0, max: 100, unit: '%' };
const hue = { min: 0, max: 360, unit: '°' };
const cct = { min: 2000, max: 10000, unit: 'K' };

function hsic(bits: Bits): LibraryChannel[] {
	const step = bits === 16 ? 2 : 1;
	return [
		{ offset: 1, parameter: 'intensity', bits, default: 0, ...pct },
		{ offset: 1 + step, parameter: 'hue', bits, default: 0, ...hue },
		{ offset: 1 + 2 * step, parameter: 'saturation', bits, default: 0, ...pct },
		{ offset: 1 + 3 * step, parameter: 'cct', bits, default: 0, ...cct }
	];
}

export const TYPE_LIBRARY: LibraryType[] = [
	{
		key: 'rgbw-engine',
		maker: 'Generic',
		model: 'RGBW engine',
		notes: 'Starting point: a colour LED engine. Check offsets against the unit’s manual.',
		modes: [
			{ name: 'HSIC 8-bit', channels: hsic(8) },
			{ name: 'HSIC 16-bit', channels: hsic(16) },
			{
				name: 'RGBW direct',
				channels: [
					{ offset: 1, parameter: 'intensity', bits: 8, default: 0, ...pct },
					{ offset: 2, parameter: 'red', bits: 8, default: 0 },
					{ offset: 3, parameter: 'green', bits: 8, default: 0 },
					{ offset: 4, parameter: 'blue', bits: 8, default: 0 },
					{ offset: 5, parameter: 'white', bits: 8, default: 0 },
					{ offset: 6, parameter: 'strobe', bits: 8, default: 0 }
				]
			}
		]
	},
	{
		key: 'dimmer',
		maker: 'Generic',
		model: 'Dimmer',
		notes: 'Starting point: an intensity-only unit or dimmer channel.',
		modes: [
			{ name: 'Dimmer 8-bit', channels: [{ offset: 1, parameter: 'intensity', bits: 8, default: 0, ...pct }] },
			{ name: 'Dimmer 16-bit', channels: [{ offset: 1, parameter: 'intensity', bits: 16, default: 0, ...pct }] }
		]
	}
];

export const PARAMETERS = [
	'intensity',
	'hue',
	'saturation',
	'cct',
	'red',
	'green',
	'blue',
	'white',
	'strobe',
	'fan',
	'control'
];
