// Colour preview for swatches on screen — a preview, not a colour-accurate claim.

export interface Xy {
	x: number;
	y: number;
}

export interface Xyz {
	X: number;
	Y: number;
	Z: number;
}

/** Channels 0–1 (gamma-encoded unless the name says linear). */
export type Rgb = [number, number, number];

// Kim et al. 2002 (US patent 7,024,034) cubic spline of the Planckian locus, valid 1667–25000 K.
export const CCT_MIN = 1667;
export const CCT_MAX = 25000;

/** CCT → CIE 1931 xy on the Planckian locus; kelvin outside 1667–25000 is clamped. */
export function cctToXy(kelvin: number): Xy {
	const t = Math.min(Math.max(kelvin, CCT_MIN), CCT_MAX);
	const t2 = t * t;
	const t3 = t2 * t;
	const x =
		t <= 4000
			? -0.2661239e9 / t3 - 0.2343589e6 / t2 + 0.8776956e3 / t + 0.17991
			: -3.0258469e9 / t3 + 2.1070379e6 / t2 + 0.2226347e3 / t + 0.24039;
	const x2 = x * x;
	const x3 = x2 * x;
	const y =
		t <= 2222
			? -1.1063814 * x3 - 1.3481102 * x2 + 2.18555832 * x - 0.20219683
			: t <= 4000
				? -0.9549476 * x3 - 1.37418593 * x2 + 2.09137015 * x - 0.16748867
				: 3.081758 * x3 - 5.8733867 * x2 + 3.75112997 * x - 0.37001483;
	return { x, y };
}

/** xyY with the given luminance → XYZ. */
export function xyToXyz({ x, y }: Xy, Y = 1): Xyz {
	return { X: (x / y) * Y, Y, Z: ((1 - x - y) / y) * Y };
}

/** IEC 61966-2-1: XYZ (D65) → linear sRGB. */
export function xyzToLinearSrgb({ X, Y, Z }: Xyz): Rgb {
	return [
		3.2406 * X - 1.5372 * Y - 0.4986 * Z,
		-0.9689 * X + 1.8758 * Y + 0.0415 * Z,
		0.0557 * X - 0.204 * Y + 1.057 * Z
	];
}

/** IEC 61966-2-1 transfer curve; negatives mirror it (extended sRGB, as CSS Color 4 does). */
export function encodeSrgb(linear: number): number {
	const a = Math.abs(linear);
	const v = a <= 0.0031308 ? 12.92 * a : 1.055 * a ** (1 / 2.4) - 0.055;
	return linear < 0 ? -v : v;
}

export function decodeSrgb(encoded: number): number {
	const a = Math.abs(encoded);
	const v = a <= 0.04045 ? a / 12.92 : ((a + 0.055) / 1.055) ** 2.4;
	return encoded < 0 ? -v : v;
}

/** XYZ → gamma-encoded sRGB, unclamped (out-of-gamut colours give values outside 0–1). */
export function xyzToSrgb(xyz: Xyz): Rgb {
	const [r, g, b] = xyzToLinearSrgb(xyz);
	return [encodeSrgb(r), encodeSrgb(g), encodeSrgb(b)];
}

function clamp01(v: number): number {
	return v < 0 ? 0 : v > 1 ? 1 : v;
}

/**
 * CCT swatch: locus xy → XYZ (Y = 1) → linear sRGB, negatives clipped, scaled so the largest
 * channel is 1 (then dimmed by intensity), then encoded.
 */
export function cctToSrgb(kelvin: number, intensityPercent = 100): Rgb {
	const lin = xyzToLinearSrgb(xyToXyz(cctToXy(kelvin))).map((c) => Math.max(c, 0));
	const peak = Math.max(...lin);
	const k = peak > 0 ? clamp01(intensityPercent / 100) / peak : 0;
	return [encodeSrgb(lin[0] * k), encodeSrgb(lin[1] * k), encodeSrgb(lin[2] * k)];
}

/**
 * HSI swatch: hue in degrees and saturation % as HSV at full value, then intensity % scales the
 * light in linear sRGB (IEC 61966-2-1 decode, scale, encode), as the CCT swatch does — so 50 % is
 * half the light, not half the code value. A simple screen swatch; a fixture's own HSI-to-emitter
 * maths differs by maker.
 */
export function hsiToSrgb(hueDegrees: number, saturationPercent: number, intensityPercent: number): Rgb {
	const k = clamp01(intensityPercent / 100);
	return hsvFull(hueDegrees, saturationPercent).map((c) => encodeSrgb(decodeSrgb(c) * k)) as Rgb;
}

function hsvFull(hueDegrees: number, saturationPercent: number): Rgb {
	const h = (((hueDegrees % 360) + 360) % 360) / 60;
	const s = clamp01(saturationPercent / 100);
	const v = 1;
	const c = v * s;
	const x = c * (1 - Math.abs((h % 2) - 1));
	const m = v - c;
	const sector = Math.floor(h);
	const [r, g, b]: Rgb =
		sector === 0
			? [c, x, 0]
			: sector === 1
				? [x, c, 0]
				: sector === 2
					? [0, c, x]
					: sector === 3
						? [0, x, c]
						: sector === 4
							? [x, 0, c]
							: [c, 0, x];
	return [r + m, g + m, b + m];
}

/** Encoded sRGB 0–1 → "#rrggbb" (clamped, round half up). */
export function rgbToHex(rgb: Rgb): string {
	return `#${rgb
		.map((c) =>
			Math.floor(clamp01(c) * 255 + 0.5)
				.toString(16)
				.padStart(2, '0')
		)
		.join('')}`;
}

export function cctSwatch(kelvin: number, intensityPercent = 100): string {
	return rgbToHex(cctToSrgb(kelvin, intensityPercent));
}

export function hsiSwatch(hueDegrees: number, saturationPercent: number, intensityPercent: number): string {
	return rgbToHex(hsiToSrgb(hueDegrees, saturationPercent, intensityPercent));
}
