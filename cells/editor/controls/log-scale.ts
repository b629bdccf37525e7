/** Steps of a log slider: fine enough for epsilon tuning, coarse enough for the keyboard. */
export const LOG_SLIDER_STEPS = 1000;

/**
 * Slider position (0 … steps) of `value` on a log scale from `min` to `max`
 * (0 < min < max). Values outside are clamped to the ends.
 */
export function logPosition(value: number, min: number, max: number, steps = LOG_SLIDER_STEPS): number {
  if (!(min > 0 && max > min)) throw new RangeError(`a log scale needs 0 < min < max, got min ${min}, max ${max}`);
  const v = Math.min(max, Math.max(min, value));
  return Math.round((Math.log(v / min) / Math.log(max / min)) * steps);
}

/**
 * Value at slider position `position` (0 … steps) of a log scale from `min` to
 * `max`, rounded to `digits` significant digits (default 3, so the study file holds
 * 0.0123 rather than 0.012302687708123818) and kept within [min, max]; the ends
 * are exact.
 */
export function logValue(position: number, min: number, max: number, steps = LOG_SLIDER_STEPS, digits = 3): number {
  if (!(min > 0 && max > min)) throw new RangeError(`a log scale needs 0 < min < max, got min ${min}, max ${max}`);
  if (position <= 0) return min;
  if (position >= steps) return max;
  const raw = min * Math.pow(max / min, position / steps);
  return Math.min(max, Math.max(min, roundSignificant(raw, digits)));
}

/** `x` rounded to `digits` significant digits, as the shortest number that prints so. */
export function roundSignificant(x: number, digits: number): number {
  if (x === 0 || !Number.isFinite(x)) return x;
  return Number(x.toPrecision(digits));
}

/** A linear slider's value at `position` of `steps` from min to max, snapped to `step` when given. */
export function linearValue(position: number, min: number, max: number, steps: number, step?: number): number {
  const raw = min + ((max - min) * Math.min(steps, Math.max(0, position))) / steps;
  if (step !== undefined && step > 0) {
    const snapped = min + Math.round((raw - min) / step) * step;
    return Math.min(max, Math.max(min, roundSignificant(snapped, 12)));
  }
  return roundSignificant(raw, 4);
}
