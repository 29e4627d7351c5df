/**
 * Import profiles: the options of a plant's export format (column headers, units, delimiter,
 * decimal separator, date order, time zone), saved under a name so the next export of the same
 * plant imports with one word. Saving a name again replaces that profile; both write the audit log.
 */
import {
  IMPORT_PROFILE_REF, SAVE_IMPORT_PROFILE_REQUEST,
  type ImportProfileJson, type ImportProfileOptions, type ImportProfileRef, type ListImportProfilesResponse, type SaveImportProfileRequest,
} from '../../shared/contract/imports.js';
import { isoOf, validate } from '../../shared/contract/schema.js';
import { InputError } from '../../shared/errors.js';
import type { ServiceContext } from './context.js';

interface ProfileRow {
  id: number;
  name: string;
  mapping_json: string;
  units_json: string;
  options_json: string;
  created_ms: number;
}

type OtherOptions = Omit<ImportProfileOptions, 'columns' | 'units'>;

function toJson(r: ProfileRow): ImportProfileJson {
  const columns = JSON.parse(r.mapping_json) as ImportProfileOptions['columns'];
  const units = JSON.parse(r.units_json) as ImportProfileOptions['units'];
  const other = JSON.parse(r.options_json) as OtherOptions;
  return {
    name: r.name,
    ...(columns !== undefined && Object.keys(columns).length > 0 ? { columns } : {}),
    ...(units !== undefined && Object.keys(units).length > 0 ? { units } : {}),
    ...other,
    created: isoOf(r.created_ms),
  };
}

export function importProfileServices(ctx: ServiceContext) {
  const db = ctx.fdb.db;
  const byName = db.prepare<[string], ProfileRow>('SELECT * FROM import_profiles WHERE name = ?');
  const all = db.prepare<[], ProfileRow>('SELECT * FROM import_profiles ORDER BY name');
  const insert = db.prepare<[string, string, string, string, number]>(
    'INSERT INTO import_profiles (name, mapping_json, units_json, options_json, created_ms) VALUES (?, ?, ?, ?, ?)',
  );
  const replace = db.prepare<[string, string, string, number, number]>(
    'UPDATE import_profiles SET mapping_json = ?, units_json = ?, options_json = ?, created_ms = ? WHERE id = ?',
  );

  const saveTx = db.transaction((req: SaveImportProfileRequest): ImportProfileJson => {
    const { name, columns, units, ...other } = req;
    const old = byName.get(name);
    const values = [JSON.stringify(columns ?? {}), JSON.stringify(units ?? {}), JSON.stringify(other)] as const;
    let id: number;
    if (old === undefined) id = Number(insert.run(name, ...values, ctx.now()).lastInsertRowid);
    else {
      replace.run(...values, ctx.now(), old.id);
      id = old.id;
    }
    const saved = byName.get(name) as ProfileRow;
    ctx.audit.record({
      who: ctx.who, action: old === undefined ? 'create' : 'edit', entity: 'import-profile', entityId: id,
      ...(old !== undefined ? { old: toJson(old) } : {}), new: toJson(saved),
    });
    return toJson(saved);
  });

  return {
    saveImportProfile(request: SaveImportProfileRequest): ImportProfileJson {
      return saveTx.immediate(validate(SAVE_IMPORT_PROFILE_REQUEST, request));
    },

    loadImportProfile(request: ImportProfileRef): ImportProfileJson {
      const { name } = validate(IMPORT_PROFILE_REF, request);
      const row = byName.get(name);
      if (row === undefined) {
        const names = all.all().map((p) => JSON.stringify(p.name));
        throw new InputError(`no import profile named ${JSON.stringify(name)}; saved profiles: ${names.length === 0 ? 'none' : names.join(', ')}`, { field: 'profile' });
      }
      return toJson(row);
    },

    listImportProfiles(): ListImportProfilesResponse {
      return { profiles: all.all().map(toJson) };
    },
  };
}
