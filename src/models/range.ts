/**
 * Validity-range checks shared by the models. Each model declares its ranges
 * as data (`*_VALIDITY`) so the scenario loader can check user input early;
 * the model itself throws a RangeError naming the function, the argument,
 * the value and the allowed range when it is called outside them.
 */

/** Closed interval [min, max]. */
export type Interval = readonly [number, number];

/** Throws `fn: name = value is outside min–max unit` unless min ≤ value ≤ max (NaN always fails). */
export function checkRange(fn: string, name: string, value: number, range: Interval, unit = ''): void {
  if (!(value >= range[0] && value <= range[1])) {
    throw new RangeError(`${fn}: ${name} = ${value} is outside ${range[0]}–${range[1]}${unit ? ' ' + unit : ''}`);
  }
}

/** Throws unless value is a finite number ≥ min (or > min when `strict`). */
export function checkAtLeast(fn: string, name: string, value: number, min: number, unit = '', strict = false): void {
  const ok = Number.isFinite(value) && (strict ? value > min : value >= min);
  if (!ok) {
    throw new RangeError(`${fn}: ${name} = ${value} is outside ${strict ? '>' : '≥'} ${min}${unit ? ' ' + unit : ''}`);
  }
}

