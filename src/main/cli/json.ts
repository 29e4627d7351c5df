/**
 * JSON for machines: numbers in SI, non-finite numbers (NaN, ±Infinity) as null — JSON has no
 * spelling for them — and typed arrays as plain arrays.
 */
export function toJsonText(value: unknown): string {
  return JSON.stringify(value, replacer, 2) + '\n';
}

function replacer(_key: string, value: unknown): unknown {
  if (typeof value === 'number' && !Number.isFinite(value)) return null;
  if (ArrayBuffer.isView(value) && !(value instanceof DataView)) return Array.from(value as unknown as ArrayLike<number>);
  return value;
}

/** A finite number, or null. */
export function finiteOrNull(value: number | null | undefined): number | null {
  return typeof value === 'number' && Number.isFinite(value) ? value : null;
}
