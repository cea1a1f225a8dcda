/**
 * Branded numbers for lengths along a trace, where a parameter could be
 * given in either unit: samples (points) or the trace's own x-units. Both
 * are plain numbers at run time; the brand only lets the compiler refuse a
 * width in x-units where points are asked for, and the other way round.
 * Convert with {@link toPoints} and {@link toXUnits} at a known spacing.
 */
declare const unit: unique symbol;

/** A count or length in samples (points). */
export type Points = number & { readonly [unit]: 'points' };

/** A length or position along x, in the trace's x-units. */
export type XUnits = number & { readonly [unit]: 'x-units' };

/** A number of points, as a {@link Points}. */
export const points = (n: number): Points => n as Points;

/** A length in x-units, as an {@link XUnits}. */
export const xUnits = (v: number): XUnits => v as XUnits;

/** A length in x-units as points, at a spacing of dx x-units per point. */
export const toPoints = (v: XUnits, dx: XUnits): Points => (v / dx) as Points;

/** A length in points as x-units, at a spacing of dx x-units per point. */
export const toXUnits = (n: Points, dx: XUnits): XUnits => (n * dx) as XUnits;
