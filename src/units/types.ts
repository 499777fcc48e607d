/**
 * Unit-branded numbers for public APIs: a `Seconds` cannot be passed where `Hertz`
 * is wanted. Inner loops use plain numbers with the unit in the variable name.
 */
declare const unit: unique symbol;
export type Quantity<U extends string> = number & { readonly [unit]: U };

export type Seconds = Quantity<'s'>;
export type Hertz = Quantity<'Hz'>;
export type Volts = Quantity<'V'>;
export type Amperes = Quantity<'A'>;
export type Ohms = Quantity<'ohm'>;
export type Farads = Quantity<'F'>;
export type Henries = Quantity<'H'>;
export type Watts = Quantity<'W'>;
export type Metres = Quantity<'m'>;
export type Pascals = Quantity<'Pa'>;
export type Kelvin = Quantity<'K'>;
/** Sound pressure level re 20 µPa. */
export type DbSpl = Quantity<'dB SPL'>;
/** Plain decibels (a ratio). */
export type Decibels = Quantity<'dB'>;

/** Brand a plain number once its unit is known (at a parse or API boundary). */
export const as = <Q extends Quantity<string>>(value: number): Q => value as Q;
