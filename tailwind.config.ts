import type { Config } from 'tailwindcss';

// Colours come from CSS variables so the light, dark and dim (on-set) themes
// swap with one attribute; see src/app.css.
const token = (name: string) => `rgb(var(--pw-${name}) / <alpha-value>)`;

export default {
	content: ['./src/**/*.{html,svelte,ts}'],
	theme: {
		extend: {
			fontFamily: {
				sans: ['"IBM Plex Sans"', 'system-ui', 'sans-serif'],
				mono: ['ui-monospace', 'SFMono-Regular', 'Menlo', 'monospace']
			},
			colors: {
				canvas: token('canvas'),
				panel: token('panel'),
				raised: token('raised'),
				line: token('line'),
				ink: token('ink'),
				muted: token('muted'),
				brand: token('brand'),
				'brand-ink': token('brand-ink'),
				ok: token('ok'),
				warn: token('warn'),
				bad: token('bad'),
				info: token('info')
			}
		}
	}
} satisfies Config;
