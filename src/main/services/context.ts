/**
 * What every service module shares: the repositories over one field log, who is acting, the clock,
 * and finding a field, well or reservoir by the names a request uses.
 */
import { InputError } from '../../shared/errors.js';
import { AuditLog } from '../db/audit.js';
import type { FieldDb } from '../db/database.js';
import { FieldRepository, type Field } from '../db/fields.js';
import { ReadingRepository } from '../db/readings.js';
import { ReservoirRepository, type Reservoir } from '../db/reservoirs.js';
import { WellRepository, type Well } from '../db/wells.js';

export interface ServiceOptions {
  /** Recorded in the audit log; default 'tauwell'. */
  who?: string;
  /** Clock in Unix epoch ms for what the services record themselves (stored fits); default the field log's. */
  now?: () => number;
}

export interface ServiceContext {
  fdb: FieldDb;
  who: string;
  now: () => number;
  fields: FieldRepository;
  wells: WellRepository;
  reservoirs: ReservoirRepository;
  readings: ReadingRepository;
  audit: AuditLog;
  field(name: string): Field;
  /** The well named `well`, in `field` when given; a name found in several fields needs the field. */
  well(ref: { well: string; field?: string }): { well: Well; field: Field };
  reservoir(ref: { reservoir: string; field?: string }): { reservoir: Reservoir; field: Field };
  fieldOf(id: number): Field;
  reservoirName(id: number | null): string | null;
}

export function createContext(fdb: FieldDb, options: ServiceOptions = {}): ServiceContext {
  const fields = new FieldRepository(fdb);
  const wells = new WellRepository(fdb);
  const reservoirs = new ReservoirRepository(fdb);
  const who = (options.who ?? 'tauwell').trim();
  if (who === '') throw new InputError('must name who is acting, for the audit log', { field: 'who' });

  const field = (name: string): Field => {
    const f = fields.findByName(name);
    if (f === undefined) throw new InputError(`no field named ${JSON.stringify(name)}; the field log has ${namesOf(fields.list())}`, { field: 'field' });
    return f;
  };
  const fieldOf = (id: number): Field => fields.get(id) as Field;

  /** One lookup for wells and reservoirs: by name within a field, or across fields when unique. */
  function named<T extends { fieldId: number }>(
    kind: 'well' | 'reservoir', name: string, fieldName: string | undefined, find: (fieldId: number, name: string) => T | undefined,
  ): { item: T; field: Field } {
    if (fieldName !== undefined) {
      const f = field(fieldName);
      const item = find(f.id, name);
      if (item === undefined) throw new InputError(`field ${JSON.stringify(f.name)} has no ${kind} named ${JSON.stringify(name)}`, { field: kind });
      return { item, field: f };
    }
    const hits = fields.list().flatMap((f) => {
      const item = find(f.id, name);
      return item === undefined ? [] : [{ item, field: f }];
    });
    if (hits.length === 1) return hits[0];
    if (hits.length === 0) throw new InputError(`no ${kind} named ${JSON.stringify(name)} in the field log`, { field: kind });
    throw new InputError(`${hits.length} fields have a ${kind} named ${JSON.stringify(name)} (${namesOf(hits.map((h) => h.field))}); name the field`, { field: 'field' });
  }

  return {
    fdb,
    who,
    now: options.now ?? fdb.now,
    fields,
    wells,
    reservoirs,
    readings: new ReadingRepository(fdb),
    audit: new AuditLog(fdb),
    field,
    well(ref) {
      const { item, field: f } = named('well', ref.well, ref.field, (id, n) => wells.findByName(id, n));
      return { well: item, field: f };
    },
    reservoir(ref) {
      const { item, field: f } = named('reservoir', ref.reservoir, ref.field, (id, n) => reservoirs.findByName(id, n));
      return { reservoir: item, field: f };
    },
    fieldOf,
    reservoirName: (id) => (id === null ? null : reservoirs.get(id)?.name ?? null),
  };
}

function namesOf(items: readonly { name: string }[]): string {
  if (items.length === 0) return 'none';
  return items.map((i) => JSON.stringify(i.name)).join(', ');
}
