/**
 * Focuses the control that edits a recipe parameter named in the URL hash (a finding's
 * path, e.g. `#steps%5B2%5D.interval`): the element whose `data-path` is the longest prefix.
 */
export function focusPathFromHash(root: HTMLElement): void {
	const path = decodeURIComponent(location.hash.slice(1));
	if (!path) return;
	let best: HTMLElement | null = null;
	let bestLength = -1;
	for (const el of root.querySelectorAll<HTMLElement>('[data-path]')) {
		const p = el.dataset.path ?? '';
		if (path.startsWith(p) && p.length > bestLength) {
			best = el;
			bestLength = p.length;
		}
	}
	if (!best) return;
	best.scrollIntoView({ block: 'center' });
	const focusable = best.matches('input, select, textarea, button') ? best : best.querySelector<HTMLElement>('input, select, textarea, button');
	focusable?.focus();
}
