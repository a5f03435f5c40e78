// Types for the part of the astronomia package (dev dependency) that the geometry tests compare against.
declare module 'astronomia/angle' {
	type Position = { ra: number; dec: number };
	/** Separation in radians, numerically stable form (Meeus, Astronomical Algorithms ch. 17). */
	export function sepPauwels(c1: Position, c2: Position): number;
	/** Separation in radians, haversine form (Meeus eq. 17.5). */
	export function sepHav(c1: Position, c2: Position): number;
}
