/**
 * The report model: everything an offline decline report shows, as one JSON-safe record built from
 * the service responses a screen receives (the transports' wire encoding: null where the engine has
 * NaN, plain arrays), so a report and the screens read the same numbers. Values stay SI; the report
 * page formats them in the display units the model names (settings, or the command line's --units).
 *
 * A section that cannot show a number says why in plain words (`statement`): a field with no
 * readings, a well with too few points to fit, a fit that did not converge, a forecast refused.
 *
 * Exported API:
 *   REPORT_FORMAT, REPORT_FORMAT_VERSION
 *   interface ReportSources, WellSources        what the collector hands in
 *   buildReportModel(sources): ReportModel
 *   types ReportModel, ReportMeta, WellReport, FieldReport, … (below and in well-section.ts, field-section.ts)
 */
import { CAUTIONS } from '../cautions.js';
import type { Wire } from '../contract/channels.js';
import type { ImportRecordJson } from '../contract/imports.js';
import type { SettingsJson, AboutFieldLogJson, DisplayUnits } from '../contract/settings.js';
import type { FieldInfo } from '../contract/wells.js';
import type { FieldOverview } from '../contract/overview.js';
import { buildFieldReport, type FieldReport } from './field-section.js';
import { REPORT_METHOD, type MethodSection } from './method.js';
import { buildWellReport, type WellReport, type WellSources } from './well-section.js';

export type { WellSources, WellReport } from './well-section.js';
export type { FieldReport } from './field-section.js';

export const REPORT_FORMAT = 'tauwell-report';
export const REPORT_FORMAT_VERSION = 1;

export type ReportScope = { kind: 'well'; well: string; field: string } | { kind: 'field'; field: string };

export interface ReportSources {
  scope: ReportScope;
  /** ISO 8601 UTC. */
  generatedAt: string;
  about: Wire<AboutFieldLogJson>;
  /** The settings the report follows, with any override (units) already applied. */
  settings: Wire<SettingsJson>;
  field: Wire<FieldInfo>;
  /** The field's overview (thermal output, data quality); null when it could not be had. */
  overview: Wire<FieldOverview> | null;
  /** The wells of the report: the one well, or every well of the field. */
  wells: WellSources[];
  /** Imports into the field log, newest first; null when the back end keeps no import history. */
  imports: Wire<ImportRecordJson>[] | null;
  /** SHA-256 (hex) over the wells' stored-fit fingerprints in well order; null when no well was fitted. */
  fingerprint: string | null;
}

export interface StoredFitRef {
  well: string;
  fitId: number;
  /** SHA-256 over the readings that entered the fit (and the well's Tref and time zero). */
  fingerprint: string;
  createdAt: string;
  engineVersion: string;
}

export interface ReportMeta {
  generatedAt: string;
  appVersion: string;
  engineVersion: string;
  /** Absolute path of the field log; null for an in-memory log. */
  database: string | null;
  schemaVersion: number;
  fingerprint: string | null;
  fits: StoredFitRef[];
  units: DisplayUnits;
  /** IANA zone every date of the report is shown in. */
  timeZone: string;
  horizonYears: number;
  backgroundHeatFlowWPerM2: number;
  cautions: string[];
}

/** One import as the report lists it: the contract's record, without its mapping and options. */
export type ImportRow = Pick<ImportRecordJson, 'id' | 'file' | 'started' | 'status' | 'rowsRead' | 'imported' | 'duplicates' | 'conflicts' | 'rejected' | 'flagged'>;

export interface ImportSummary {
  /** The field the imports went into (an import may hold readings of several wells). */
  field: string;
  /** False when the import history could not be read: the counts below are then zero, not "none". */
  available: boolean;
  files: number;
  rowsRead: number;
  imported: number;
  rejected: number;
  duplicates: number;
  conflicts: number;
  /** The newest imports, at most IMPORT_ROWS of them. */
  rows: ImportRow[];
}

export interface ReportModel {
  format: typeof REPORT_FORMAT;
  formatVersion: typeof REPORT_FORMAT_VERSION;
  title: string;
  subtitle: string;
  scope: ReportScope;
  meta: ReportMeta;
  /** The field's summary page of a field report; null in a well report. */
  field: FieldReport | null;
  wells: WellReport[];
  imports: ImportSummary;
  method: MethodSection;
}

/** How many imports a report lists (the counts cover them all). */
export const IMPORT_ROWS = 12;

export function buildReportModel(sources: ReportSources): ReportModel {
  const s = sources;
  const timeZone = s.settings.timeZone ?? s.field.timeZone;
  const wells = s.wells.map((w) => buildWellReport(w, s.overview));
  const fits: StoredFitRef[] = wells.flatMap((w) => (w.fit === null ? [] : [{
    well: w.well.name, fitId: w.fit.fitId, fingerprint: w.fit.fingerprint, createdAt: w.fit.createdAt, engineVersion: w.fit.engineVersion,
  }]));
  const title = s.scope.kind === 'well' ? `Decline report — well ${s.scope.well}` : `Decline report — field ${s.scope.field}`;
  const subtitle = s.scope.kind === 'well'
    ? `${s.scope.field}${wells[0]?.well.reservoir ? ` · reservoir ${wells[0].well.reservoir}` : ''}`
    : `${wells.length} well${wells.length === 1 ? '' : 's'} · time zone ${timeZone}`;
  return {
    format: REPORT_FORMAT,
    formatVersion: REPORT_FORMAT_VERSION,
    title,
    subtitle,
    scope: s.scope,
    meta: {
      generatedAt: s.generatedAt,
      appVersion: s.about.appVersion,
      engineVersion: s.about.engineVersion,
      database: s.about.path,
      schemaVersion: s.about.schemaVersion,
      fingerprint: s.fingerprint,
      fits,
      units: s.settings.units,
      timeZone,
      horizonYears: s.settings.horizonYears,
      backgroundHeatFlowWPerM2: s.settings.backgroundHeatFlowWPerM2,
      cautions: [...CAUTIONS],
    },
    field: s.scope.kind === 'field' ? buildFieldReport(s.field, s.overview, wells) : null,
    wells: s.scope.kind === 'field' ? wells.filter((w) => w.well.kind === 'production') : wells,
    imports: importSummary(s.field.name, s.imports),
    method: REPORT_METHOD,
  };
}

/** The imports into `field` (others are left out), counted, and the newest IMPORT_ROWS listed. */
export function importSummary(field: string, imports: readonly Wire<ImportRecordJson>[] | null): ImportSummary {
  const mine = (imports ?? []).filter((i) => i.field === field);
  const sum = (key: 'rowsRead' | 'imported' | 'rejected' | 'duplicates' | 'conflicts'): number => mine.reduce((a, i) => a + (i[key] ?? 0), 0);
  return {
    field,
    available: imports !== null,
    files: mine.length,
    rowsRead: sum('rowsRead'),
    imported: sum('imported'),
    rejected: sum('rejected'),
    duplicates: sum('duplicates'),
    conflicts: sum('conflicts'),
    rows: mine.slice(0, IMPORT_ROWS).map((i) => ({
      id: i.id, file: i.file, started: i.started, status: i.status, rowsRead: i.rowsRead, imported: i.imported,
      duplicates: i.duplicates, conflicts: i.conflicts, rejected: i.rejected, flagged: i.flagged,
    })),
  };
}
