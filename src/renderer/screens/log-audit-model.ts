/**
 * A well's audit trail as the log book shows it: the entries about the well and its readings, each
 * change as "old → new" in the display units. The audit log holds the rows as stored (snake_case
 * columns of db/readings.ts, camelCase of db/wells.ts), so the labels below name those keys.
 * No DOM here (tested in test/renderer-log.test.ts).
 *
 *   auditChanges(entry, display): AuditChange[]
 *   wellAuditRows(entries, wellId, display): AuditRow[]
 */
import type { Wire } from '../../shared/contract/channels.js';
import type { AuditEntryJson } from '../../shared/contract/readings.js';
import type { Display } from '../app/display.js';

export interface AuditChange {
  label: string;
  from: string;
  to: string;
}

export interface AuditRow {
  id: number;
  at: string;
  who: string;
  action: string;
  /** 'reading of 2025-12-15 09:00' or 'well KR-3'. */
  what: string;
  changes: AuditChange[];
  reason: string;
}

/** Labels of the stored columns (the audit log holds the rows as stored, db/readings.ts and db/wells.ts). */
const LABELS: Record<string, string> = {
  time_ms: 'time',
  production_temperature_c: 'production temperature',
  injection_temperature_c: 'injection temperature',
  normalised_mass_flow_kg_s: 'mass flow',
  mass_flow_kg_s: 'mass flow as logged',
  volume_flow_m3_s: 'volume flow as logged',
  flow_density_kg_m3: 'water density used',
  pressure_pa: 'pressure',
  status: 'status',
  note: 'note',
  flags: 'flags',
  temperature_unit: 'temperatures entered in',
  flow_unit: 'flow entered in',
  pressure_unit: 'pressure entered in',
  deleted_ms: 'deleted',
  name: 'name',
  kind: 'kind',
  referenceTemperatureC: 'Tref',
  productionStartMs: 'production start',
};

const ACTIONS: Record<string, string> = { create: 'logged', edit: 'edited', delete: 'deleted' };

/** `extra` more decimals than the display's own, for two values that would otherwise read the same. */
function valueText(key: string, v: unknown, display: Display, extra = 0): string {
  if (v === null || v === undefined || v === '') return '—';
  if (typeof v !== 'number') return typeof v === 'string' ? v : JSON.stringify(v);
  const digits = (q: 'temperature' | 'massFlow' | 'volumeFlow' | 'pressure'): number | undefined =>
    extra === 0 ? undefined : Math.max(0, Number(display.format(q, 1).split(' ')[0].split('.')[1]?.length ?? 0)) + extra;
  if (key.endsWith('_ms') || key.endsWith('Ms')) return display.dateTime(v);
  if (key.endsWith('_c') || key.endsWith('C')) return display.formatCelsius(v, digits('temperature'));
  if (key.endsWith('_kg_s')) return display.format('massFlow', v, digits('massFlow'));
  if (key.endsWith('_m3_s')) return display.format('volumeFlow', v, digits('volumeFlow'));
  if (key.endsWith('_kg_m3')) return `${v.toFixed(1 + extra)} kg/m³`;
  if (key.endsWith('_pa')) return display.format('pressure', v, digits('pressure'));
  return String(v);
}

function asRecord(v: unknown): Record<string, unknown> | null {
  return typeof v === 'object' && v !== null && !Array.isArray(v) ? (v as Record<string, unknown>) : null;
}

/** Book-keeping of a logged reading that its values already show: left out of a creation's list. */
const NOT_FOR_CREATION = new Set(['temperature_unit', 'flow_unit', 'pressure_unit', 'mass_flow_kg_s', 'flow_density_kg_m3']);

/** The changes of one entry, old → new, in the order of LABELS; a creation lists what was set. */
export function auditChanges(entry: Wire<AuditEntryJson>, display: Display): AuditChange[] {
  const before = asRecord(entry.old);
  const after = asRecord(entry.new);
  const out: AuditChange[] = [];
  for (const [key, label] of Object.entries(LABELS)) {
    if (before === null && NOT_FOR_CREATION.has(key)) continue;
    // A mass flow logged as such is its own normalised mass flow: one line says it.
    if (key === 'mass_flow_kg_s' && JSON.stringify(before?.[key]) === JSON.stringify(before?.normalised_mass_flow_kg_s)
      && JSON.stringify(after?.[key]) === JSON.stringify(after?.normalised_mass_flow_kg_s)) continue;
    const a = before?.[key];
    const b = after?.[key];
    if (before === null && (b === null || b === undefined || b === '')) continue;
    if (before !== null && after !== null && JSON.stringify(a) === JSON.stringify(b)) continue;
    if (a === undefined && b === undefined) continue;
    let from = before === null ? '—' : valueText(key, a, display);
    let to = after === null ? '—' : valueText(key, b, display);
    if (from === to && typeof a === 'number' && typeof b === 'number') {
      // 41.93 → 41.88 kg/s both read '41.9 kg/s': show two more decimals so the change is visible.
      from = valueText(key, a, display, 2);
      to = valueText(key, b, display, 2);
    }
    out.push({ label, from, to });
  }
  return out;
}

/** The entries about one well and its readings, newest first, as shown beneath the readings. */
export function wellAuditRows(entries: readonly Wire<AuditEntryJson>[], wellId: number, display: Display): AuditRow[] {
  const rows: AuditRow[] = [];
  for (const e of entries) {
    const row = asRecord(e.new) ?? asRecord(e.old);
    let what: string;
    if (e.entity === 'reading' && row?.well_id === wellId) {
      const t = typeof row.time_ms === 'number' ? display.dateTime(row.time_ms) : `#${e.entityId}`;
      what = `reading of ${t}`;
    } else if (e.entity === 'well' && e.entityId === wellId) {
      what = `well ${typeof row?.name === 'string' ? row.name : e.entityId}`;
    } else continue;
    rows.push({
      id: e.id,
      at: display.dateTime(e.at),
      who: e.who,
      action: e.entity === 'well' && e.action === 'create' ? 'created' : (ACTIONS[e.action] ?? e.action),
      what,
      changes: auditChanges(e, display),
      reason: e.reason,
    });
  }
  return rows.sort((a, b) => b.id - a.id);
}

