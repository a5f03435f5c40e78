import type { Config } from 'tailwindcss';

// Phasewright's own palette: deep ink and slate neutrals, a teal accent, amber and
// rose only for findings (warning, error). Chosen for contrast (WCAG AA on both themes).
export default {
	content: ['./src/**/*.{html,svelte,ts}'],
	darkMode: 'class',
	theme: {
		extend: {
			fontFamily: {
				sans: ['"Fira Sans"', 'system-ui', 'sans-serif'],
				mono: ['"Fira Mono"', 'ui-monospace', 'monospace']
			},
			colors: {
				ink: { 50: '#f5f7f9', 100: '#e8edf2', 200: '#cdd7e1', 300: '#a3b3c4', 500: '#5b6f85', 700: '#2f3e50', 800: '#1f2a37', 900: '#121a24', 950: '#0a1017' },
				tide: { 100: '#d5f3ef', 300: '#7fd6cb', 500: '#1f9e8f', 600: '#15806f', 700: '#0f6357', 900: '#083a33' }
			}
		}
	}
} satisfies Config;
