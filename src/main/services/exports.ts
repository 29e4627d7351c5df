/**
 * Exports: readings, rejected import rows, import conflicts and the audit log, as CSV (a header
 * row; SI and °C, the unit in each header, instants in UTC) or as JSON (the contract's objects).
 */
import { EXPORT_REQUEST, type ExportFormat, type ExportKind, type ExportRequest, type ExportResponse } from '../../shared/contract/exports.js';
import type { AuditEntryJson, ReadingJson } from '../../shared/contract/readings.js';
import { instantMs, isoOf, validate } from '../../shared/contract/schema.js';
import { InputError } from '../../shared/errors.js';
import type { AuditEntry } from '../db/audit.js';
import type { Reading } from '../db/readings.js';
import type { ServiceContext } from './context.js';
import { csvText, type Cell } from './csv.js';
import { auditJson, readingJson } from './views.js';

const PA_PER_MPA = 1e6;

interface Table<T> {
  rows: T[];
  header: string[];
  csvRow(row: T): Cell[];
}

const READING_HEADER = [
  'id', 'well', 'time [UTC]', 'production_temperature [°C]', 'injection_temperature [°C]', 'mass_flow [kg/s]',
  'volume_flow [m3/s]', 'flow_density [kg/m3]', 'pressure [Pa]', 'status', 'flags', 'note', 'source', 'import_id',
  'source_line', 'deleted [UTC]',
];

const AUDIT_HEADER = ['id', 'at [UTC]', 'who', 'action', 'entity', 'entity_id', 'reason', 'old (JSON)', 'new (JSON)'];

export interface RejectedRowJson {
  importId: number;
  file: string;
  line: number;
  reason: string;
  raw: string;
}

export interface ConflictJson {
  id: number;
  importId: number;
  line: number;
  well: string;
  time: string;
  existingReadingId: number;
  resolution: string;
  resolvedAt: string | null;
  /** The imported values, as the import stored them. */
  values: unknown;
  raw: string;
}

export function exportServices(ctx: ServiceContext) {
  const db = ctx.fdb.db;
  const importExists = db.prepare<[number], { id: number }>('SELECT id FROM imports WHERE id = ?');
  const anyReadings = db.prepare<[number, number, number], { id: number }>(
    'SELECT id FROM readings WHERE well_id = ? AND time_ms BETWEEN ? AND ? ORDER BY time_ms, id',
  );
  const rejected = db.prepare<[{ importId: number | null }], { import_id: number; file_name: string; line: number; reason: string; raw: string }>(
    `SELECT r.import_id, i.file_name, r.line, r.reason, r.raw FROM rejected_rows r JOIN imports i ON i.id = r.import_id
      WHERE (@importId IS NULL OR r.import_id = @importId) ORDER BY r.import_id, r.line, r.id`,
  );
  const conflicts = db.prepare<[{ importId: number | null }], {
    id: number; import_id: number; line: number; well: string; time_ms: number; existing_reading_id: number;
    resolution: string; resolved_ms: number | null; values_json: string; raw: string;
  }>(
    `SELECT c.id, c.import_id, c.line, w.name AS well, c.time_ms, c.existing_reading_id, c.resolution, c.resolved_ms, c.values_json, c.raw
       FROM conflicts c JOIN wells w ON w.id = c.well_id
      WHERE (@importId IS NULL OR c.import_id = @importId) ORDER BY c.import_id, c.line, c.id`,
  );
  const audit = db.prepare<[number, number], {
    id: number; at_ms: number; who: string; action: string; entity: string; entity_id: number; old_json: string | null; new_json: string | null; reason: string;
  }>('SELECT * FROM audit_log WHERE at_ms BETWEEN ? AND ? ORDER BY id');

  function readingsTable(req: ExportRequest, fromMs: number, toMs: number): Table<ReadingJson> {
    const wells = req.well !== undefined
      ? [ctx.well({ well: req.well, ...(req.field !== undefined ? { field: req.field } : {}) }).well]
      : (req.field === undefined ? ctx.fields.list() : [ctx.field(req.field)]).flatMap((f) => ctx.wells.listByField(f.id));
    const rows = wells.flatMap((w) => {
      const stored = req.includeDeleted === true
        ? anyReadings.all(w.id, fromMs, toMs).map((r) => ctx.readings.get(r.id) as Reading)
        : ctx.readings.listLive(w.id, { fromMs, toMs });
      return stored.map((r) => readingJson(r, w.name));
    });
    return {
      rows,
      header: READING_HEADER,
      csvRow: (r) => [
        r.id, r.well, r.time, r.productionTemperatureC, r.injectionTemperatureC, r.massFlowKgPerS, r.volumeFlowM3PerS,
        r.flowDensityKgPerM3, r.pressureMPa === null ? null : r.pressureMPa * PA_PER_MPA, r.status, r.flags.join(' '), r.note,
        r.source, r.importId, r.sourceLine, r.deletedAt,
      ],
    };
  }

  function requireImport(id: number | undefined): number | null {
    if (id === undefined) return null;
    if (importExists.get(id) === undefined) throw new InputError(`no import with id ${id}`, { field: 'importId' });
    return id;
  }

  function table(kind: ExportKind, req: ExportRequest): Table<unknown> {
    const fromMs = req.from === undefined ? Number.MIN_SAFE_INTEGER : instantMs(req.from);
    const toMs = req.to === undefined ? Number.MAX_SAFE_INTEGER : instantMs(req.to);
    if (fromMs > toMs) throw new InputError(`the window ends (${req.to}) before it starts (${req.from})`, { field: 'to' });
    switch (kind) {
      case 'readings':
        return readingsTable(req, fromMs, toMs) as Table<unknown>;
      case 'rejected': {
        const rows: RejectedRowJson[] = rejected.all({ importId: requireImport(req.importId) }).map((r) => ({ importId: r.import_id, file: r.file_name, line: r.line, reason: r.reason, raw: r.raw }));
        return { rows, header: ['import_id', 'file', 'line', 'reason', 'raw'], csvRow: (r) => { const x = r as RejectedRowJson; return [x.importId, x.file, x.line, x.reason, x.raw]; } };
      }
      case 'conflicts': {
        const rows: ConflictJson[] = conflicts.all({ importId: requireImport(req.importId) }).map((c) => ({
          id: c.id, importId: c.import_id, line: c.line, well: c.well, time: isoOf(c.time_ms), existingReadingId: c.existing_reading_id,
          resolution: c.resolution, resolvedAt: c.resolved_ms === null ? null : isoOf(c.resolved_ms), values: JSON.parse(c.values_json), raw: c.raw,
        }));
        return {
          rows,
          header: ['id', 'import_id', 'line', 'well', 'time [UTC]', 'existing_reading_id', 'resolution', 'resolved [UTC]', 'values (JSON)', 'raw'],
          csvRow: (r) => {
            const c = r as ConflictJson;
            return [c.id, c.importId, c.line, c.well, c.time, c.existingReadingId, c.resolution, c.resolvedAt, JSON.stringify(c.values), c.raw];
          },
        };
      }
      case 'audit': {
        // Oldest first, every entry: an export is the whole record, unlike the newest-first listing.
        const rows: AuditEntryJson[] = audit.all(fromMs, toMs).map((a) => auditJson({
          id: a.id, atMs: a.at_ms, who: a.who, action: a.action, entity: a.entity, entityId: a.entity_id, oldJson: a.old_json, newJson: a.new_json, reason: a.reason,
        } satisfies AuditEntry));
        return {
          rows,
          header: AUDIT_HEADER,
          csvRow: (r) => {
            const a = r as AuditEntryJson;
            return [a.id, a.at, a.who, a.action, a.entity, a.entityId, a.reason, a.old === null ? null : JSON.stringify(a.old), a.new === null ? null : JSON.stringify(a.new)];
          },
        };
      }
    }
  }

  return {
    exportData(request: ExportRequest): ExportResponse {
      const req = validate(EXPORT_REQUEST, request);
      const format: ExportFormat = req.format ?? 'csv';
      if (req.kind !== 'readings' && (req.well !== undefined || req.includeDeleted !== undefined)) {
        throw new InputError(`applies to readings exports only, not to ${req.kind}`, { field: req.well !== undefined ? 'well' : 'includeDeleted' });
      }
      if ((req.kind === 'readings' || req.kind === 'audit') && req.importId !== undefined) {
        throw new InputError(`applies to rejected and conflicts exports only, not to ${req.kind}`, { field: 'importId' });
      }
      const t = table(req.kind, req);
      const text = format === 'csv'
        ? csvText(t.header, t.rows.map((r) => t.csvRow(r)))
        : JSON.stringify({ kind: req.kind, exportedAt: isoOf(ctx.now()), rows: t.rows }, null, 2) + '\n';
      const scope = req.kind === 'readings' && req.well !== undefined ? `-${req.well}` : req.importId !== undefined ? `-import-${req.importId}` : '';
      return {
        kind: req.kind,
        format,
        mediaType: format === 'csv' ? 'text/csv' : 'application/json',
        suggestedFileName: `${req.kind}${scope}.${format}`.replace(/[^A-Za-z0-9._-]/g, '_'),
        rowCount: t.rows.length,
        columns: t.header,
        text,
      };
    },
  };
}
