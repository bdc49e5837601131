import type { Config } from 'tailwindcss';

/**
 * Tapline's palette and type scale. Colour names come from the trade: asphalt for the road-grey
 * neutrals, amp for the amber of a 7.5–20 A fuse's family of warm colours, copper for conductors,
 * tap for the teal of a live, confirmed circuit, fault for errors. Contrast of text pairs is
 * checked against WCAG 2.2 AA (4.5:1) in DEVELOPERS.md.
 */
export default {
	content: ['./src/**/*.{html,js,svelte,ts}'],
	theme: {
		extend: {
			colors: {
				asphalt: {
					50: '#f4f6f8',
					100: '#e6eaef',
					200: '#cbd3dc',
					300: '#a3b0be',
					400: '#74859a',
					500: '#56677c',
					600: '#435266',
					700: '#354254',
					800: '#253041',
					900: '#172030',
					950: '#0d1420'
				},
				amp: {
					50: '#fff8eb',
					100: '#feecc7',
					200: '#fdd68a',
					300: '#fcbb4d',
					400: '#fba224',
					500: '#f0820b',
					600: '#c96106',
					700: '#a04509',
					800: '#82370f',
					900: '#6b2e10'
				},
				copper: {
					100: '#f8e6dc',
					300: '#e4a98a',
					500: '#c46e45',
					700: '#8f4524'
				},
				tap: {
					50: '#ecfdf9',
					100: '#cff9ef',
					300: '#6fe3cb',
					500: '#17b199',
					600: '#0b8f7c',
					700: '#0d7265',
					900: '#0f4741'
				},
				fault: {
					50: '#fef2f2',
					100: '#fde3e3',
					500: '#dc3b3b',
					600: '#b92525',
					700: '#991f1f'
				}
			},
			fontFamily: {
				sans: ['Nunito', 'ui-sans-serif', 'system-ui', 'sans-serif']
			},
			fontSize: {
				// A 1.2 (minor third) scale from a 16 px body.
				caption: ['0.8125rem', { lineHeight: '1.15rem' }],
				body: ['1rem', { lineHeight: '1.6rem' }],
				lead: ['1.2rem', { lineHeight: '1.8rem' }],
				h3: ['1.44rem', { lineHeight: '1.9rem', fontWeight: '700' }],
				h2: ['1.728rem', { lineHeight: '2.2rem', fontWeight: '800' }],
				h1: ['2.074rem', { lineHeight: '2.5rem', fontWeight: '800' }],
				display: ['2.986rem', { lineHeight: '3.3rem', fontWeight: '900' }]
			},
			borderRadius: {
				blade: '0.375rem'
			}
		}
	}
} satisfies Config;
