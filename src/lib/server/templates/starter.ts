// The starter template set, bundled at build time (no runtime file paths: STYLE.md §7).
const modules = import.meta.glob('/templates/**/*.hbs', { query: '?raw', import: 'default', eager: true }) as Record<string, string>;

export const STARTER_TEMPLATE_NAME = 'standard';

/** Paths relative to `templates/` → sources, e.g. `python/calibrate.py.hbs`. */
export const STARTER_FILES: Readonly<Record<string, string>> = Object.fromEntries(
	Object.entries(modules)
		.map(([path, source]) => [path.replace(/^\/templates\//, ''), source] as const)
		.sort(([a], [b]) => (a < b ? -1 : 1))
);
