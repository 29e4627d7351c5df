/**
 * Wells of a field: production or injection, optionally in a reservoir of the same field, with the
 * reference temperature Tref (°C) for θ = Tprod − Tref and the date production started.
 *
 * Exported API:
 *   type WellKind = 'production' | 'injection'
 *   interface Well { id; fieldId; reservoirId; name; kind; referenceTemperatureC; productionStartMs; createdMs }
 *   interface NewWell { fieldId; name; kind; reservoirId?; referenceTemperatureC?; productionStartMs? }
 *   type WellChanges = Partial<Pick<Well, 'name' | 'kind' | 'reservoirId' | 'referenceTemperatureC' | 'productionStartMs'>>
 *   class WellRepository(fdb: FieldDb)
 *     create(input: NewWell): Well
 *     get(id): Well | undefined
 *     findByName(fieldId, name): Well | undefined
 *     listByField(fieldId): Well[]                                  by name
 *     update(id, changes: WellChanges, by: { who; reason? }): Well  writes an 'edit' audit row in the same transaction
 */
import type Database from 'better-sqlite3';
import { InputError } from '../../shared/errors.js';
import { AuditLog } from './audit.js';
import { isConstraintError, optionalNumber, requireId, requireInstantMs, requireText } from './checks.js';
import type { FieldDb } from './database.js';

export type WellKind = 'production' | 'injection';

export interface Well {
  id: number;
  fieldId: number;
  reservoirId: number | null;
  name: string;
  kind: WellKind;
  /** Tref, °C: the minimum useful temperature; null when not set for this well. */
  referenceTemperatureC: number | null;
  productionStartMs: number | null;
  createdMs: number;
}

export interface NewWell {
  fieldId: number;
  name: string;
  kind: WellKind;
  reservoirId?: number | null;
  referenceTemperatureC?: number | null;
  productionStartMs?: number | null;
}

export type WellChanges = Partial<Pick<Well, 'name' | 'kind' | 'reservoirId' | 'referenceTemperatureC' | 'productionStartMs'>>;

interface WellRow {
  id: number;
  field_id: number;
  reservoir_id: number | null;
  name: string;
  kind: WellKind;
  reference_temperature_c: number | null;
  production_start_ms: number | null;
  created_ms: number;
}

type WellValues = Omit<WellRow, 'id' | 'created_ms'>;

/** Absolute zero on the Celsius scale (SI Brochure): no reference temperature can be below it. */
const ABSOLUTE_ZERO_C = -273.15;

export class WellRepository {
  private readonly now: () => number;
  private readonly audit: AuditLog;
  private readonly fieldExists: Database.Statement<[number]>;
  private readonly reservoirField: Database.Statement<[number], { field_id: number }>;
  private readonly insert: Database.Statement<[Record<string, unknown>]>;
  private readonly change: Database.Statement<[Record<string, unknown>]>;
  private readonly byId: Database.Statement<[number], WellRow>;
  private readonly byName: Database.Statement<[number, string], WellRow>;
  private readonly byField: Database.Statement<[number], WellRow>;
  private readonly updateTx: (id: number, changes: WellChanges, who: string, reason: string) => Well;

  constructor(fdb: FieldDb) {
    const db = fdb.db;
    this.now = fdb.now;
    this.audit = new AuditLog(fdb);
    this.fieldExists = db.prepare('SELECT 1 FROM fields WHERE id = ?');
    this.reservoirField = db.prepare('SELECT field_id FROM reservoirs WHERE id = ?');
    this.insert = db.prepare(
      `INSERT INTO wells (field_id, reservoir_id, name, kind, reference_temperature_c, production_start_ms, created_ms)
       VALUES (@field_id, @reservoir_id, @name, @kind, @reference_temperature_c, @production_start_ms, @created_ms)`,
    );
    this.change = db.prepare(
      `UPDATE wells SET reservoir_id = @reservoir_id, name = @name, kind = @kind,
              reference_temperature_c = @reference_temperature_c, production_start_ms = @production_start_ms
        WHERE id = @id`,
    );
    this.byId = db.prepare('SELECT * FROM wells WHERE id = ?');
    this.byName = db.prepare('SELECT * FROM wells WHERE field_id = ? AND name = ?');
    this.byField = db.prepare('SELECT * FROM wells WHERE field_id = ? ORDER BY name');

    const tx = db.transaction((id: number, changes: WellChanges, who: string, reason: string): Well => {
      const old = this.byId.get(id);
      if (old === undefined) throw new InputError(`no well with id ${id}`, { field: 'id' });
      const values = this.checked({
        field_id: old.field_id,
        reservoir_id: 'reservoirId' in changes ? changes.reservoirId ?? null : old.reservoir_id,
        name: changes.name ?? old.name,
        kind: changes.kind ?? old.kind,
        reference_temperature_c: 'referenceTemperatureC' in changes ? changes.referenceTemperatureC ?? null : old.reference_temperature_c,
        production_start_ms: 'productionStartMs' in changes ? changes.productionStartMs ?? null : old.production_start_ms,
      });
      this.write(() => this.change.run({ ...values, id }), values.name);
      const updated = this.byId.get(id) as WellRow;
      this.audit.record({ who, action: 'edit', entity: 'well', entityId: id, old, new: updated, reason });
      return toWell(updated);
    });
    this.updateTx = (...args) => tx.immediate(...args);
  }

  create(input: NewWell): Well {
    const fieldId = requireId(input.fieldId, 'fieldId');
    if (this.fieldExists.get(fieldId) === undefined) throw new InputError(`no field with id ${fieldId}`, { field: 'fieldId' });
    const values = this.checked({
      field_id: fieldId,
      reservoir_id: input.reservoirId ?? null,
      name: input.name,
      kind: input.kind,
      reference_temperature_c: input.referenceTemperatureC ?? null,
      production_start_ms: input.productionStartMs ?? null,
    });
    const id = this.write(() => Number(this.insert.run({ ...values, created_ms: this.now() }).lastInsertRowid), values.name);
    return this.get(id) as Well;
  }

  get(id: number): Well | undefined {
    const row = this.byId.get(id);
    return row === undefined ? undefined : toWell(row);
  }

  findByName(fieldId: number, name: string): Well | undefined {
    const row = this.byName.get(fieldId, name.trim());
    return row === undefined ? undefined : toWell(row);
  }

  listByField(fieldId: number): Well[] {
    return this.byField.all(fieldId).map(toWell);
  }

  update(id: number, changes: WellChanges, by: { who: string; reason?: string }): Well {
    return this.updateTx(requireId(id, 'id'), changes, requireText(by.who, 'who'), by.reason ?? '');
  }

  private checked(v: WellValues): WellValues {
    const kind = v.kind;
    if (kind !== 'production' && kind !== 'injection') {
      throw new InputError(`must be "production" or "injection" (got ${JSON.stringify(kind)})`, { field: 'kind' });
    }
    if (v.reservoir_id !== null) {
      const reservoir = this.reservoirField.get(requireId(v.reservoir_id, 'reservoirId'));
      if (reservoir === undefined) throw new InputError(`no reservoir with id ${v.reservoir_id}`, { field: 'reservoirId' });
      if (reservoir.field_id !== v.field_id) {
        throw new InputError(`reservoir ${v.reservoir_id} belongs to another field`, { field: 'reservoirId' });
      }
    }
    return {
      field_id: v.field_id,
      reservoir_id: v.reservoir_id,
      name: requireText(v.name, 'name'),
      kind,
      reference_temperature_c: optionalNumber(v.reference_temperature_c, 'referenceTemperatureC', ABSOLUTE_ZERO_C),
      production_start_ms: v.production_start_ms === null ? null : requireInstantMs(v.production_start_ms, 'productionStartMs'),
    };
  }

  private write<T>(run: () => T, name: string): T {
    try {
      return run();
    } catch (e) {
      if (isConstraintError(e, 'UNIQUE')) throw new InputError(`this field already has a well named ${JSON.stringify(name)}`, { field: 'name' });
      throw e;
    }
  }
}

function toWell(r: WellRow): Well {
  return {
    id: r.id,
    fieldId: r.field_id,
    reservoirId: r.reservoir_id,
    name: r.name,
    kind: r.kind,
    referenceTemperatureC: r.reference_temperature_c,
    productionStartMs: r.production_start_ms,
    createdMs: r.created_ms,
  };
}
