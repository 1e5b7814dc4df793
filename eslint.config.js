import js from '@eslint/js';
import svelte from 'eslint-plugin-svelte';
import globals from 'globals';
import ts from 'typescript-eslint';
import svelteConfig from './svelte.config.js';

export default ts.config(
	{ ignores: ['build/', '.svelte-kit/', 'node_modules/', 'data/', 'drizzle/', 'test-results/'] },
	js.configs.recommended,
	...ts.configs.recommended,
	...svelte.configs.recommended,
	{
		languageOptions: { globals: { ...globals.browser, ...globals.node } },
		rules: {
			'no-undef': 'off',
			// no base path is configured, so plain hrefs are correct; resolve() would only add noise
			'svelte/no-navigation-without-resolve': 'off',
			'@typescript-eslint/no-unused-vars': [
				'error',
				{ argsIgnorePattern: '^_', varsIgnorePattern: '^_', destructuredArrayIgnorePattern: '^_' }
			]
		}
	},
	{
		files: ['**/*.ts', '**/*.svelte', '**/*.svelte.ts'],
		languageOptions: {
			parserOptions: {
				projectService: true,
				extraFileExtensions: ['.svelte'],
				parser: ts.parser,
				svelteConfig,
				tsconfigRootDir: import.meta.dirname
			}
		},
		rules: {
			'@typescript-eslint/no-floating-promises': 'error',
			'@typescript-eslint/no-misused-promises': ['error', { checksVoidReturn: { attributes: false } }]
		}
	},
	{
		// one error model (DEVELOPERS.md "Errors"): below the routes, throw the domain errors of
		// src/lib/server/errors.ts; only api() and action() know about HTTP
		files: [
			'src/lib/server/db/**/*.ts',
			'src/lib/server/import/**/*.ts',
			'src/lib/server/export/**/*.ts',
			'src/lib/server/review.ts',
			'src/lib/server/revision-access.ts',
			'src/lib/patch/**/*.ts'
		],
		rules: {
			'@typescript-eslint/no-restricted-imports': [
				'error',
				{
					paths: [
						{
							name: '@sveltejs/kit',
							allowTypeImports: true,
							message: 'Throw a domain error from src/lib/server/errors.ts; api() and action() map it to HTTP.'
						}
					],
					patterns: [
						{
							group: ['**/api', '$lib/server/api'],
							importNames: ['ApiError', 'apiError', 'api'],
							message: 'Throw a domain error from src/lib/server/errors.ts; api() maps it once.'
						}
					]
				}
			]
		}
	},
	{
		// these configs sit outside tsconfig's include; lint them without type information
		files: ['eslint.config.js', 'svelte.config.js'],
		...ts.configs.disableTypeChecked
	}
);
