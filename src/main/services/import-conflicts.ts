/**
 * Conflicts an import held back — a row with the same well and instant as a stored reading but
 * other values — listed and resolved one by one or all of an import's at once: keep the existing
 * reading, or replace it by the imported values. A replacement soft-deletes the old reading and
 * stores the new one with the import's provenance (import id, line), so both stay on record; every
 * resolution writes the audit log in the same transaction.
 */
import {
  LIST_CONFLICTS_REQUEST, RESOLVE_CONFLICTS_REQUEST,
  type ConflictJson, type ConflictResolution, type ImportedValues, type ListConflictsRequest, type ListConflictsResponse,
  type ResolveConflictsRequest, type ResolveConflictsResponse,
} from '../../shared/contract/imports.js';
import { isoOf, validate } from '../../shared/contract/schema.js';
import { InputError } from '../../shared/errors.js';
import type { ServiceContext } from './context.js';
import { readingJson } from './views.js';

interface ConflictRow {
  id: number;
  import_id: number;
  line: number;
  raw: string;
  well_id: number;
  well: string;
  field: string;
  time_ms: number;
  values_json: string;
  existing_reading_id: number;
  resolution: ConflictResolution;
  resolved_ms: number | null;
}

const SELECT = `SELECT c.*, w.name AS well, f.name AS field FROM conflicts c JOIN wells w ON w.id = c.well_id JOIN fields f ON f.id = w.field_id`;

export function conflictServices(ctx: ServiceContext) {
  const db = ctx.fdb.db;
  const byId = db.prepare<[number], ConflictRow>(`${SELECT} WHERE c.id = ?`);
  const list = db.prepare<[{ importId: number | null; open: number }], ConflictRow>(
    `${SELECT} WHERE (@importId IS NULL OR c.import_id = @importId) AND (@open = 0 OR c.resolution = 'open') ORDER BY c.import_id, c.line, c.id`,
  );
  const openOfImport = db.prepare<[number], ConflictRow>(`${SELECT} WHERE c.import_id = ? AND c.resolution = 'open' ORDER BY c.line, c.id`);
  const importExists = db.prepare<[number], { id: number }>('SELECT id FROM imports WHERE id = ?');
  const settle = db.prepare<[string, number, number]>(`UPDATE conflicts SET resolution = ?, resolved_ms = ? WHERE id = ? AND resolution = 'open'`);

  function toJson(c: ConflictRow): ConflictJson {
    const existing = ctx.readings.get(c.existing_reading_id);
    return {
      id: c.id, importId: c.import_id, line: c.line, raw: c.raw, well: c.well, field: c.field, time: isoOf(c.time_ms),
      values: JSON.parse(c.values_json) as ImportedValues,
      existing: existing === undefined ? null : readingJson(existing, c.well),
      resolution: c.resolution,
      resolvedAt: c.resolved_ms === null ? null : isoOf(c.resolved_ms),
    };
  }

  function requireImport(id: number): void {
    if (importExists.get(id) === undefined) throw new InputError(`no import with id ${id}`, { field: 'importId' });
  }

  function resolveOne(c: ConflictRow, keep: 'existing' | 'new', reason: string): void {
    const resolution: ConflictResolution = keep === 'existing' ? 'kept-existing' : 'replaced';
    const why = reason !== '' ? reason : `conflict ${c.id} (import ${c.import_id}, line ${c.line}) resolved: ${keep === 'existing' ? 'kept the existing reading' : 'replaced by the imported values'}`;
    let replacedId: number | null = null;
    let newId: number | null = null;
    if (keep === 'new') {
      const live = ctx.readings.findLive(c.well_id, c.time_ms);
      if (live !== undefined) {
        ctx.readings.softDelete(live.id, { who: ctx.who, reason: why });
        replacedId = live.id;
      }
      const v = JSON.parse(c.values_json) as ImportedValues;
      newId = ctx.readings.insert(
        { wellId: c.well_id, timeMs: c.time_ms, source: 'import', importId: c.import_id, sourceLine: c.line, ...v, flags: [] },
        { who: ctx.who, reason: why },
      );
    }
    settle.run(resolution, ctx.now(), c.id);
    ctx.audit.record({
      who: ctx.who, action: 'resolve', entity: 'conflict', entityId: c.id,
      old: { resolution: 'open', existingReadingId: c.existing_reading_id },
      new: { resolution, ...(keep === 'new' ? { replacedReadingId: replacedId, newReadingId: newId } : { keptReadingId: c.existing_reading_id }) },
      reason: why,
    });
  }

  const resolveTx = db.transaction((rows: ConflictRow[], keep: 'existing' | 'new', reason: string): void => {
    for (const c of rows) resolveOne(c, keep, reason);
  });

  return {
    listConflicts(request: ListConflictsRequest = {}): ListConflictsResponse {
      const req = validate(LIST_CONFLICTS_REQUEST, request);
      if (req.importId !== undefined) requireImport(req.importId);
      return { conflicts: list.all({ importId: req.importId ?? null, open: req.open === true ? 1 : 0 }).map(toJson) };
    },

    resolveConflicts(request: ResolveConflictsRequest): ResolveConflictsResponse {
      const req = validate(RESOLVE_CONFLICTS_REQUEST, request);
      let rows: ConflictRow[];
      if (req.id !== undefined) {
        if (req.importId !== undefined || req.all !== undefined) throw new InputError('give either one conflict id, or an import with all: true, not both', { field: 'id' });
        const c = byId.get(req.id);
        if (c === undefined) throw new InputError(`no conflict with id ${req.id}`, { field: 'id' });
        if (c.resolution !== 'open') {
          throw new InputError(`conflict ${c.id} is already resolved (${c.resolution}${c.resolved_ms === null ? '' : ` at ${isoOf(c.resolved_ms)}`})`, { field: 'id' });
        }
        rows = [c];
      } else if (req.importId !== undefined) {
        if (req.all !== true) throw new InputError('to resolve every open conflict of an import, say all: true (or give one conflict id)', { field: 'all' });
        requireImport(req.importId);
        rows = openOfImport.all(req.importId);
      } else {
        throw new InputError('name a conflict (id) or an import (importId) with all: true', { field: 'id' });
      }
      const ids = rows.map((r) => r.id);
      resolveTx.immediate(rows, req.keep, req.reason ?? '');
      return { resolved: ids.map((id) => toJson(byId.get(id) as ConflictRow)) };
    },
  };
}
