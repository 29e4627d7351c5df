/** The model's number and instant conventions: null where the engine has no finite value, ISO 8601 UTC instants. */

export function fin(v: number | null | undefined): number | null {
  return typeof v === 'number' && Number.isFinite(v) ? v : null;
}

export function iso(ms: number): string {
  return new Date(ms).toISOString();
}
