import { converter } from 'culori';
import { describe, expect, it } from 'vitest';
import {
	cctSwatch,
	cctToSrgb,
	cctToXy,
	decodeSrgb,
	encodeSrgb,
	hsiSwatch,
	rgbToHex,
	xyToXyz,
	xyzToLinearSrgb,
	xyzToSrgb
} from '../../../src/lib/patch';

describe('CCT → CIE 1931 xy (Kim et al. 2002 spline of the Planckian locus)', () => {
	it('puts 2856 K within 0.002 of CIE illuminant A (0.4476, 0.4074 — CIE 15)', () => {
		const { x, y } = cctToXy(2856);
		expect(Math.abs(x - 0.4476)).toBeLessThan(0.002);
		expect(Math.abs(y - 0.4074)).toBeLessThan(0.002);
	});

	it('puts 6500 K on the locus at ≈ (0.3135, 0.3237), not at D65 (0.3127, 0.3290), which lies off it', () => {
		const { x, y } = cctToXy(6500);
		expect(x).toBeCloseTo(0.3135, 3);
		expect(y).toBeCloseTo(0.3237, 3);
		expect(Math.abs(y - 0.329)).toBeGreaterThan(0.004);
	});

	it('is continuous where the spline pieces meet (2222 K, 4000 K) and clamps outside 1667–25000 K', () => {
		for (const t of [2222, 4000]) {
			const lo = cctToXy(t - 0.01);
			const hi = cctToXy(t + 0.01);
			expect(Math.abs(lo.x - hi.x) + Math.abs(lo.y - hi.y)).toBeLessThan(0.002);
		}
		expect(cctToXy(1000)).toEqual(cctToXy(1667));
		expect(cctToXy(40000)).toEqual(cctToXy(25000));
	});

	it('gets warmer (less blue) as kelvin falls', () => {
		const warm = cctToSrgb(2000);
		const cool = cctToSrgb(9000);
		expect(warm[2]).toBeLessThan(cool[2]);
		expect(Math.max(...warm)).toBeCloseTo(1, 9);
		expect(cctSwatch(3200)).toMatch(/^#ff[0-9a-f]{4}$/);
	});
});

describe('XYZ → sRGB (IEC 61966-2-1)', () => {
	it('turns D65 white (0.9505, 1, 1.089) into (255, 255, 255)', () => {
		const rgb = xyzToSrgb({ X: 0.9505, Y: 1, Z: 1.089 });
		expect(rgb.map((c) => Math.round(c * 255))).toEqual([255, 255, 255]);
		expect(rgbToHex(rgb)).toBe('#ffffff');
	});

	it('uses the standard transfer curve and inverts it', () => {
		expect(encodeSrgb(0.0031308)).toBeCloseTo(0.04045, 4);
		expect(encodeSrgb(1)).toBeCloseTo(1, 12);
		for (let v = 0; v <= 1; v += 0.05) expect(decodeSrgb(encodeSrgb(v))).toBeCloseTo(v, 12);
	});

	it('agrees with culori (xyz65 → rgb) on a grid: linear within 0.001, encoded within one 8-bit step', () => {
		// culori derives its matrix from the primaries at full precision; the IEC matrix is rounded
		// to 4 places, and the curve's slope of 12.92 near black magnifies that once encoded.
		const toRgb = converter('rgb');
		const toLinear = converter('lrgb');
		let checked = 0;
		for (let X = 0; X <= 1; X += 0.125) {
			for (let Y = 0; Y <= 1; Y += 0.125) {
				for (let Z = 0; Z <= 1.125; Z += 0.125) {
					const ours = xyzToSrgb({ X, Y, Z });
					const theirs = toRgb({ mode: 'xyz65', x: X, y: Y, z: Z });
					expect(Math.abs(ours[0] - theirs.r)).toBeLessThan(1 / 255);
					expect(Math.abs(ours[1] - theirs.g)).toBeLessThan(1 / 255);
					expect(Math.abs(ours[2] - theirs.b)).toBeLessThan(1 / 255);
					const lin = xyzToLinearSrgb({ X, Y, Z });
					const theirLin = toLinear({ mode: 'xyz65', x: X, y: Y, z: Z });
					expect(
						Math.abs(lin[0] - theirLin.r) + Math.abs(lin[1] - theirLin.g) + Math.abs(lin[2] - theirLin.b)
					).toBeLessThan(1e-3);
					checked++;
				}
			}
		}
		expect(checked).toBe(9 * 9 * 10);
	});

	it('agrees with culori on the locus colours we preview', () => {
		const toRgb = converter('rgb');
		for (let t = 2000; t <= 10000; t += 500) {
			const xyz = xyToXyz(cctToXy(t));
			const theirs = toRgb({ mode: 'xyz65', x: xyz.X, y: xyz.Y, z: xyz.Z });
			const ours = xyzToSrgb(xyz);
			expect(Math.abs(ours[0] - theirs.r) + Math.abs(ours[1] - theirs.g) + Math.abs(ours[2] - theirs.b)).toBeLessThan(
				3e-3
			);
		}
	});
});

describe('HSI swatch (hue and saturation as HSV at full value, intensity scaled in linear light)', () => {
	it('gives the primaries, a pastel and black', () => {
		expect([0, 120, 240].map((h) => hsiSwatch(h, 100, 100))).toEqual(['#ff0000', '#00ff00', '#0000ff']);
		expect(hsiSwatch(120, 50, 100)).toBe('#80ff80');
		expect(hsiSwatch(360, 100, 100)).toBe('#ff0000');
		expect(hsiSwatch(-60, 100, 100)).toBe('#ff00ff');
		expect(hsiSwatch(200, 80, 0)).toBe('#000000');
	});

	it('50 % white is half the light, like the CCT swatch: linear 0.5 encoded per IEC 61966-2-1, checked against culori', () => {
		const toRgb = converter('rgb');
		const hex = (c: { r: number; g: number; b: number }) =>
			'#' +
			[c.r, c.g, c.b]
				.map((v) =>
					Math.round(v * 255)
						.toString(16)
						.padStart(2, '0')
				)
				.join('');
		const halfWhite = hex(toRgb({ mode: 'lrgb', r: 0.5, g: 0.5, b: 0.5 }));
		expect(halfWhite).toBe('#bcbcbc');
		expect(hsiSwatch(0, 0, 50)).toBe(halfWhite);
		expect(hsiSwatch(0, 100, 50)).toBe(hex(toRgb({ mode: 'lrgb', r: 0.5, g: 0, b: 0 })));
		// the CCT swatch already scales in linear light: its brightest channel at 50 % is the same 0xbc
		expect(cctSwatch(6504, 50).slice(1, 3)).toBe('bc');
	});
});
