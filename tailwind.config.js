/** Envelo's look: warm paper, dark ink, one accent for heat and another for moisture. */
/** @type {import('tailwindcss').Config} */
export default {
	content: ['./src/**/*.{html,js,svelte,ts}'],
	theme: {
		extend: {
			fontFamily: {
				sans: ['"Source Sans 3"', 'ui-sans-serif', 'system-ui', 'sans-serif']
			},
			colors: {
				paper: { DEFAULT: '#f7f4ee', raised: '#fffdf9', sunk: '#efeae0', line: '#ddd5c6' },
				ink: { DEFAULT: '#23211d', soft: '#4a463e', faint: '#6b6559' },
				heat: { 50: '#fcf1ea', 100: '#f7dccb', 500: '#c2571a', 600: '#a54611', 700: '#843a10' },
				damp: { 50: '#ecf4f6', 100: '#cfe4ea', 500: '#2f7f95', 600: '#266a7d', 700: '#1e5564' },
				pass: { 50: '#edf6ee', 600: '#2f7a3d', 700: '#25612f' },
				caution: { 50: '#fcf5e3', 600: '#9a6a00', 700: '#7a5400' },
				fail: { 50: '#fbeceb', 600: '#b3261e', 700: '#8e1e18' }
			}
		}
	}
};
