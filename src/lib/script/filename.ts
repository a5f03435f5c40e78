/** A safe download name from a recipe title and version: `corrie-flats-l-band-v3.py`. */
export function programFilename(title: string, version: number): string {
	const slug = title
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.toLowerCase()
		.replace(/[^a-z0-9]+/g, '-')
		.replace(/^-+|-+$/g, '')
		.slice(0, 60)
		.replace(/-+$/g, '');
	return `${slug === '' ? 'calibration' : slug}-v${version}.py`;
}
