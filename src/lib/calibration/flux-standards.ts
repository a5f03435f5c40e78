import type { FluxModel, StandardName } from './recipe';
import { angularSeparationDeg as computeSeparationDeg } from './geometry';

export type FluxStandard = {
	name: StandardName;
	/** Other names the source goes by (J2000 and B1950 designations, spaced forms). */
	aliases: readonly string[];
	ra_deg: number;
	dec_deg: number;
	citation: string;
	/** log10 S[Jy] = Σ c_i (log10(ν / freq_unit_hz))^i */
	coefficients: readonly number[];
	freq_unit_hz: number;
	valid_min_hz: number;
	valid_max_hz: number;
	/** Variable sources: the polynomial describes one epoch (Perley & Butler 2013 abstract, via METHODS.md §8). */
	variable: boolean;
};

const PB2017 = 'Perley & Butler 2017, ApJS 230, 7 (arXiv:1609.05940)';
const REYNOLDS1994 = 'Reynolds 1994, ATNF memo AT/39.3/040';
const GHZ = 1e9;
const MHZ = 1e6;

function toDegreesRa(h: number, m: number, s: number): number {
	return (h + m / 60 + s / 3600) * 15;
}
function toDegreesDec(sign: 1 | -1, d: number, m: number, s: number): number {
	return sign * (d + m / 60 + s / 3600);
}

/*
 * Coefficients: METHODS.md §8 (Perley & Butler 2017; Reynolds 1994). Positions (J2000): METHODS.md §10 for 3C286,
 * 3C48, 3C147, 3C138 and PKS B1934-638; 3C123, 3C196 and 3C295 from memory. Positions are used only to recognise
 * a field within 1 arcmin, far coarser than any of these uncertainties.
 */
export const FLUX_STANDARDS: Readonly<Record<StandardName, FluxStandard>> = {
	'3C48': {
		name: '3C48', aliases: ['3C 48', 'J0137+3309', '0137+331', 'B0134+329', '0134+329'],
		ra_deg: toDegreesRa(1, 37, 41.2994), dec_deg: toDegreesDec(1, 33, 9, 35.133), citation: PB2017,
		coefficients: [1.3253, -0.7553, -0.1914, 0.0498], freq_unit_hz: GHZ, valid_min_hz: 0.05 * GHZ, valid_max_hz: 50 * GHZ, variable: true
	},
	'3C123': {
		name: '3C123', aliases: ['3C 123', 'J0437+2940', '0437+296', 'B0433+295', '0433+295'],
		ra_deg: toDegreesRa(4, 37, 4.375), dec_deg: toDegreesDec(1, 29, 40, 13.82), citation: PB2017,
		coefficients: [1.8017, -0.7884, -0.1035, -0.0248, 0.009], freq_unit_hz: GHZ, valid_min_hz: 0.05 * GHZ, valid_max_hz: 50 * GHZ, variable: false
	},
	'3C138': {
		name: '3C138', aliases: ['3C 138', 'J0521+1638', '0521+166', 'B0518+165', '0518+165'],
		ra_deg: toDegreesRa(5, 21, 9.886), dec_deg: toDegreesDec(1, 16, 38, 22.052), citation: PB2017,
		coefficients: [1.0088, -0.4981, -0.1552, -0.0102, 0.0223], freq_unit_hz: GHZ, valid_min_hz: 0.2 * GHZ, valid_max_hz: 50 * GHZ, variable: true
	},
	'3C147': {
		name: '3C147', aliases: ['3C 147', 'J0542+4951', '0542+498', 'B0538+498', '0538+498'],
		ra_deg: toDegreesRa(5, 42, 36.1379), dec_deg: toDegreesDec(1, 49, 51, 7.234), citation: PB2017,
		coefficients: [1.4516, -0.6961, -0.2007, 0.064, -0.0464, 0.0289], freq_unit_hz: GHZ, valid_min_hz: 0.05 * GHZ, valid_max_hz: 50 * GHZ, variable: true
	},
	'3C196': {
		name: '3C196', aliases: ['3C 196', 'J0813+4813', '0813+482', 'B0809+483', '0809+483'],
		ra_deg: toDegreesRa(8, 13, 36.056), dec_deg: toDegreesDec(1, 48, 13, 2.64), citation: PB2017,
		coefficients: [1.2872, -0.853, -0.1534, -0.02, 0.0201], freq_unit_hz: GHZ, valid_min_hz: 0.05 * GHZ, valid_max_hz: 50 * GHZ, variable: false
	},
	'3C286': {
		name: '3C286', aliases: ['3C 286', 'J1331+3030', '1331+305', 'B1328+307', '1328+307'],
		ra_deg: toDegreesRa(13, 31, 8.2881), dec_deg: toDegreesDec(1, 30, 30, 32.959), citation: PB2017,
		coefficients: [1.2481, -0.4507, -0.1798, 0.0357], freq_unit_hz: GHZ, valid_min_hz: 0.05 * GHZ, valid_max_hz: 50 * GHZ, variable: false
	},
	'3C295': {
		name: '3C295', aliases: ['3C 295', 'J1411+5212', '1411+522', 'B1409+524', '1409+524'],
		ra_deg: toDegreesRa(14, 11, 20.519), dec_deg: toDegreesDec(1, 52, 12, 9.97), citation: PB2017,
		coefficients: [1.4701, -0.7658, -0.278, -0.0347, 0.0399], freq_unit_hz: GHZ, valid_min_hz: 0.05 * GHZ, valid_max_hz: 50 * GHZ, variable: false
	},
	'PKS B1934-638': {
		name: 'PKS B1934-638', aliases: ['PKS 1934-638', 'B1934-638', '1934-638', 'J1939-6342', 'PKS J1939-6342'],
		ra_deg: toDegreesRa(19, 39, 25.0261), dec_deg: toDegreesDec(-1, 63, 42, 45.624), citation: REYNOLDS1994,
		coefficients: [-30.7667, 26.4908, -7.0977, 0.605334], freq_unit_hz: MHZ, valid_min_hz: 408 * MHZ, valid_max_hz: 8640 * MHZ, variable: false
	}
};

export const STANDARD_NAMES = Object.keys(FLUX_STANDARDS) as StandardName[];

function evaluatePolynomial(coefficients: readonly number[], x: number): number {
	let sum = 0;
	for (let i = coefficients.length - 1; i >= 0; i--) sum = sum * x + (coefficients[i] ?? 0);
	return sum;
}

function evaluateDerivative(coefficients: readonly number[], x: number): number {
	let sum = 0;
	for (let i = coefficients.length - 1; i >= 1; i--) sum = sum * x + i * (coefficients[i] ?? 0);
	return sum;
}

/** Flux density in Jy of a model at a frequency in Hz. */
export function fluxDensity(model: FluxModel, freqHz: number): number {
	if (model.kind === 'standard') {
		const std = FLUX_STANDARDS[model.standard];
		return 10 ** evaluatePolynomial(std.coefficients, Math.log10(freqHz / std.freq_unit_hz));
	}
	const x = Math.log10(freqHz / model.ref_freq_hz);
	return model.flux_jy * 10 ** (model.spectral_index * x + model.curvature * x * x);
}

/** Spectral index α = d log S / d log ν at a frequency in Hz (independent of the frequency unit). */
export function spectralIndex(model: FluxModel, freqHz: number): number {
	if (model.kind === 'standard') {
		const std = FLUX_STANDARDS[model.standard];
		return evaluateDerivative(std.coefficients, Math.log10(freqHz / std.freq_unit_hz));
	}
	return model.spectral_index + 2 * model.curvature * Math.log10(freqHz / model.ref_freq_hz);
}

/** Whether a standard model is used inside its fitted range; manual models carry no range and always pass. */
export function isWithinValidity(model: FluxModel, freqHz: number): boolean {
	if (model.kind === 'manual') return true;
	const std = FLUX_STANDARDS[model.standard];
	return freqHz >= std.valid_min_hz && freqHz <= std.valid_max_hz;
}

function normaliseName(name: string): string {
	return name.toUpperCase().replace(/[\s_]+/g, '');
}

const ALIAS_INDEX: ReadonlyMap<string, StandardName> = new Map(
	STANDARD_NAMES.flatMap((n) => [n, ...FLUX_STANDARDS[n].aliases].map((a) => [normaliseName(a), n] as [string, StandardName]))
);

const MATCH_RADIUS_DEG = 1 / 60;

/** Recognise a flux standard by its name or aliases, else by position within 1 arcmin. */
export function matchStandard(
	fieldName: string,
	raDeg: number,
	decDeg: number
): { standard: StandardName; reason: string } | null {
	const byName = ALIAS_INDEX.get(normaliseName(fieldName));
	if (byName) {
		const how = normaliseName(fieldName) === normaliseName(byName) ? 'is' : 'is an alias of';
		return { standard: byName, reason: `field name "${fieldName}" ${how} the flux standard ${byName} (${FLUX_STANDARDS[byName].citation})` };
	}
	for (const name of STANDARD_NAMES) {
		const std = FLUX_STANDARDS[name];
		const sep = computeSeparationDeg(raDeg, decDeg, std.ra_deg, std.dec_deg);
		if (sep <= MATCH_RADIUS_DEG) {
			return { standard: name, reason: `field position is ${(sep * 3600).toFixed(1)} arcsec from the flux standard ${name} (within 1 arcmin)` };
		}
	}
	return null;
}
