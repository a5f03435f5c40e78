const RAD = Math.PI / 180;

/**
 * Angular separation in degrees between two sky positions (degrees), Vincenty's form on the unit sphere
 * (METHODS.md §10): stable for tiny, right-angle and near-antipodal separations alike.
 */
export function angularSeparationDeg(ra1Deg: number, dec1Deg: number, ra2Deg: number, dec2Deg: number): number {
	const d1 = dec1Deg * RAD;
	const d2 = dec2Deg * RAD;
	const dRa = (ra2Deg - ra1Deg) * RAD;
	const sinD1 = Math.sin(d1);
	const cosD1 = Math.cos(d1);
	const sinD2 = Math.sin(d2);
	const cosD2 = Math.cos(d2);
	const a = cosD2 * Math.sin(dRa);
	const b = cosD1 * sinD2 - sinD1 * cosD2 * Math.cos(dRa);
	const c = sinD1 * sinD2 + cosD1 * cosD2 * Math.cos(dRa);
	return Math.atan2(Math.hypot(a, b), c) / RAD;
}
