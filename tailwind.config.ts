import type { Config } from 'tailwindcss';

/** Spoolyard's design tokens: graphite surfaces, one heat-tint blue accent, signal colours with glyphs. */
export default {
	content: ['./src/**/*.{html,js,svelte,ts}'],
	darkMode: 'class',
	theme: {
		extend: {
			colors: {
				graphite: {
					950: '#0f1216',
					900: '#161a20',
					800: '#1f252d',
					700: '#2b323c',
					600: '#3c4552',
					500: '#56606d',
					400: '#7d8794',
					300: '#a9b3be',
					200: '#cfd5dc',
					100: '#e6e9ed',
					50: '#f3f5f7'
				},
				temper: {
					700: '#2c519e',
					600: '#3560b8',
					500: '#3f6fd1',
					400: '#6890e0',
					300: '#8fb0ee'
				},
				signal: {
					go: '#2f9e7a',
					warn: '#d4a72c',
					stop: '#c2483d',
					hold: '#8a6fd1'
				}
			},
			fontFamily: {
				sans: ['Inter', 'system-ui', 'sans-serif']
			},
			fontSize: {
				floor: ['1.125rem', { lineHeight: '1.6rem' }],
				office: ['0.9375rem', { lineHeight: '1.35rem' }],
				banner: ['2.75rem', { lineHeight: '1.1' }]
			},
			minHeight: {
				touch: '44px',
				floorbtn: '64px'
			},
			minWidth: {
				touch: '44px'
			}
		}
	}
} satisfies Config;
