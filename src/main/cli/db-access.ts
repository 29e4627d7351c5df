/**
 * What the field-log commands share: the --db, --well, --field and --who options, opening the log
 * (relative to the working folder, naming the file as the user typed it), the services over it,
 * and instants typed on the command line — with Z or an offset, or naive and then read in the
 * field's time zone (DOMAIN.md §9).
 */
import { existsSync } from 'node:fs';
import { userInfo } from 'node:os';
import { resolve } from 'node:path';
import { isoOf } from '../../shared/contract/schema.js';
import { InputError } from '../../shared/errors.js';
import { ZoneResolver } from '../../shared/import/time-zone.js';
import { openDatabase, type FieldDb } from '../db/database.js';
import { createServices, type Services } from '../services/index.js';
import type { OptionSpec, ParsedArgs } from './args.js';
import type { CliIo } from './io.js';
import { parseIsoInstant } from './iso-time.js';

export const DB_OPTION: OptionSpec = { name: 'db', kind: 'value', placeholder: 'FILE', required: true, help: 'the field log (an SQLite file made by `tauwell init` or `tauwell demo`)' };
export const WELL_OPTION: OptionSpec = { name: 'well', kind: 'value', placeholder: 'NAME', required: true, help: 'well name, e.g. KR-1' };
export const FIELD_OPTION: OptionSpec = { name: 'field', kind: 'value', placeholder: 'NAME', help: 'field name; needed only when several fields have a well of that name' };
export const WHO_OPTION: OptionSpec = { name: 'who', kind: 'value', placeholder: 'NAME', defaultText: 'the operating-system user', help: 'who is making the change, for the audit log' };

export const TIME_NOTE =
  'Times: ISO 8601, e.g. 2025-03-01T08:00:00Z or 2025-03-01T21:00+13:00; a time without Z or offset is local time in the field\'s time zone.';

/** The OS user, unless --who names someone else. */
export function whoOf(args: ParsedArgs): string {
  const given = args.string('who');
  if (given !== undefined) {
    if (given.trim() === '') throw new InputError('must name who is making the change', { field: '--who' });
    return given.trim();
  }
  try {
    return userInfo().username;
  } catch {
    // No passwd entry (some containers): the environment is the next best witness.
    return process.env.USER ?? process.env.USERNAME ?? 'unknown';
  }
}

/** Opens the field log named by --db; with `mustExist`, a missing file is an error rather than a new log. */
export function openFieldLog(args: ParsedArgs, io: CliIo, mustExist = true): FieldDb {
  const typed = args.requireString('db');
  const path = resolve(io.cwd, typed);
  if (mustExist && !existsSync(path)) {
    throw new InputError(`no such field log; create one with \`tauwell init --db ${typed}\` (or \`tauwell demo --db ${typed}\`)`, { file: typed, field: '--db' });
  }
  try {
    return openDatabase(path);
  } catch (e) {
    if (e instanceof InputError) throw new InputError(e.reason, { ...e.where, file: typed });
    throw e;
  }
}

/** Runs `work` with the services over the field log of --db, closing it afterwards. */
export function withServices<T>(args: ParsedArgs, io: CliIo, work: (services: Services, fdb: FieldDb) => T, mustExist = true): T {
  const fdb = openFieldLog(args, io, mustExist);
  try {
    return work(createServices(fdb, { who: whoOf(args) }), fdb);
  } finally {
    fdb.close();
  }
}

export function wellRef(args: ParsedArgs): { well: string; field?: string } {
  const field = args.string('field');
  return { well: args.requireString('well'), ...(field !== undefined ? { field } : {}) };
}

/** The time zone naive instants are read in: of the well's field, the named field, or the log's only field; else UTC. */
export function zoneOf(services: Services, ref: { well?: string; field?: string }): string {
  if (ref.well !== undefined) return services.getWell({ well: ref.well, ...(ref.field !== undefined ? { field: ref.field } : {}) }).field.timeZone;
  const fields = services.listWells(ref.field !== undefined ? { field: ref.field } : {}).fields;
  return fields.length === 1 ? fields[0].timeZone : 'UTC';
}

export interface CliInstant {
  /** The contract's spelling: ISO 8601 UTC. */
  iso: string;
  /** How a naive time was read, for the output; empty for a time with Z or offset. */
  note: string;
}

/** The instant of option `name`, or undefined when it was not given. */
export function instantOption(args: ParsedArgs, name: string, zone: string): CliInstant | undefined {
  const text = args.string(name);
  return text === undefined ? undefined : cliInstant(text, zone, `--${name}`);
}

export function cliInstant(text: string, zone: string, field: string): CliInstant {
  const parsed = parseIsoInstant(text);
  if (!parsed.ok) throw new InputError(`${JSON.stringify(text)} ${parsed.reason}`, { field });
  if (parsed.hasOffset) return { iso: isoOf(parsed.ms), note: '' };
  const resolver = new ZoneResolver(zone, field);
  const ms = resolver.toUtcMs(parsed.ms);
  const kind = resolver.lastKind === 'ambiguous'
    ? ' (the clocks went back that night: read as the first of the two)'
    : resolver.lastKind === 'nonexistent' ? ' (a time skipped when the clocks went forward: read with the offset before the change)' : '';
  return { iso: isoOf(ms), note: `${text.trim()} read as local time in ${resolver.zone}${kind}` };
}

/** Contract field names as the options that carry them, so an error names what the user typed. */
const OPTION_OF: Readonly<Record<string, string>> = {
  well: '--well', field: '--field', time: '--time', id: '--id', reason: '--reason',
  productionTemperature: '--production-temperature', injectionTemperature: '--injection-temperature',
  temperatureUnit: '--temperature-unit', flow: '--flow', flowUnit: '--flow-unit', pressure: '--pressure',
  pressureUnit: '--pressure-unit', status: '--status', note: '--note', flags: '--flags', from: '--from', to: '--to',
  importId: '--import', model: '--model', basis: '--basis', plannedFlowKgPerS: '--planned-flow',
  specificHeatJPerKgK: '--specific-heat', referenceTemperatureC: '--reference-temperature', productionStart: '--production-start',
};

/** Runs `work`, renaming the contract field of an InputError to its command-line option. */
export function asOptions<T>(work: () => T): T {
  try {
    return work();
  } catch (e) {
    if (e instanceof InputError && e.where.field !== undefined) {
      const base = e.where.field.replace(/\[\d+\]$/, '');
      const option = OPTION_OF[base];
      if (option !== undefined) throw new InputError(e.reason, { ...e.where, field: option });
    }
    throw e;
  }
}

/** A comma list (`bad,spike`) as a list; empty entries dropped. */
export function listOption(args: ParsedArgs, name: string): string[] | undefined {
  const text = args.string(name);
  return text === undefined ? undefined : text.split(',').map((f) => f.trim()).filter((f) => f !== '');
}
