// The theme is per device: a cookie the server reads before first paint (hooks.server.ts), so no
// inline script is needed under the CSP. "dim" is the night theme's cookie value.

export const THEMES = ['system', 'light', 'dark', 'dim'] as const;
export type Theme = (typeof THEMES)[number];
export const THEME_NAMES: Record<Theme, string> = { system: 'System', light: 'Light', dark: 'Dark', dim: 'Night' };

export function currentTheme(): Theme {
	const t = document.documentElement.dataset.theme as Theme | undefined;
	return t && THEMES.includes(t) ? t : 'system';
}

export function applyTheme(theme: Theme): void {
	if (theme === 'system') {
		delete document.documentElement.dataset.theme;
		document.cookie = 'pw-theme=; path=/; max-age=0; samesite=lax';
	} else {
		document.documentElement.dataset.theme = theme;
		document.cookie = `pw-theme=${theme}; path=/; max-age=31536000; samesite=lax`;
	}
}
