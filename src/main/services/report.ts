/**
 * Offline decline reports of a well or a field: the data gathered through the one service layer
 * (the very calls the screens make, so a report and a screen never disagree), turned into the
 * report model (src/shared/report/model.ts), then into a self-contained HTML page or a PDF.
 *
 * Each well is forecast with the model, basis and window of its latest stored fit (auto on the time
 * basis for a well never fitted), the economic limit of the settings (the well's own first) unless
 * the request gives one, and the settings' horizon and background heat flow — the choices of the
 * field overview. forecastWell stores each fit it makes, so every number of a report can be traced
 * to a stored fit and the fingerprint of the readings it used.
 *
 * Exported API:
 *   interface ReportRequest { well?; field?; limit?; units? }
 *   type Paper = 'a4' | 'letter'
 *   createReportService(services, fdb, options?): {
 *     buildModel(request): ReportModel
 *     renderReportHtml(model, { paper? }?): string
 *     renderReportPdf(model, { paper }): Promise<Buffer>
 *   }
 */
import { createHash } from 'node:crypto';
import { toWire, type Wire } from '../../shared/contract/channels.js';
import type { ForecastLimit, ForecastWellResponse, ModelChoice } from '../../shared/contract/fits.js';
import type { TauwellServices } from '../../shared/contract/index.js';
import type { ImportRecordJson } from '../../shared/contract/imports.js';
import type { FieldOverview, FieldOverviewResponse, WellSeriesResponse } from '../../shared/contract/overview.js';
import type { ListReservoirVersionsResponse } from '../../shared/contract/reservoirs.js';
import { isoOf } from '../../shared/contract/schema.js';
import type { DisplayUnits, SettingsJson } from '../../shared/contract/settings.js';
import type { FieldInfo, WellInfo } from '../../shared/contract/wells.js';
import { InputError } from '../../shared/errors.js';
import type { Basis } from '../../shared/fit/types.js';
import { buildReportModel, type ReportModel, type ReportScope, type WellSources } from '../../shared/report/model.js';
import type { FieldDb } from '../db/database.js';
import { assembleReportHtml, type Paper } from '../report/assemble.js';
import { printPdf } from '../report/pdf.js';
import { createContext } from './context.js';
import { fitServices } from './fits.js';
import { forecastServices } from './forecasts.js';
import { overviewServices } from './overview.js';
import { economicLimitOf } from './settings.js';

export type { Paper } from '../report/assemble.js';

/** Imports read to count a field's (newest first); more than any field log is expected to hold. */
const IMPORTS_READ = 100_000;

export interface ReportRequest {
  /** A well report; `field` then only tells wells of the same name apart. */
  well?: string;
  /** A field report when no well is named. */
  field?: string;
  /** The economic limit of every well of the report, instead of the settings'. */
  limit?: ForecastLimit;
  /** Display units instead of the settings'. */
  units?: DisplayUnits;
}

export interface ReportServiceOptions {
  /** The built report page (default out/report/report.html of the project). */
  pageFile?: string;
  /** Where Chromium is looked for (TAUWELL_CHROMIUM), default process.env. */
  env?: Readonly<Record<string, string | undefined>>;
}

export function createReportService(services: TauwellServices, fdb: FieldDb, options: ReportServiceOptions = {}) {
  // The data quality and thermal output of the field overview, without its forecasts: the report
  // forecasts each well itself (forecastWell below), so the overview's would be made a second time.
  const ctx = createContext(fdb);
  const fits = fitServices(ctx);
  const overview = overviewServices(ctx, fits, forecastServices(ctx, fits));
  const overviewOf = (field: string): FieldOverviewResponse => overview.fieldOverview({ field }, { forecasts: false });
  function wellSources(well: WellInfo, settings: SettingsJson, limitOverride: ForecastLimit | undefined): WellSources {
    const ref = { well: well.name, field: well.field };
    const latest = services.fitStatus(ref).latest;
    const choice = {
      model: (latest?.model ?? 'auto') as ModelChoice,
      basis: latest?.basis ?? ('time' as Basis),
      why: latest === null
        ? 'no fit of this well is stored: the best model by AICc (auto), on the time basis, over all readings'
        : `the model, basis and window of the latest stored fit (${latest.createdAt})`,
    };
    let forecast: Wire<ForecastWellResponse> | null = null;
    let refused: string | null = null;
    try {
      forecast = toWire(services.forecastWell({
        ...ref, points: false, model: choice.model, basis: choice.basis,
        ...(latest?.window.from != null ? { from: latest.window.from } : {}),
        ...(latest?.window.to != null ? { to: latest.window.to } : {}),
        limit: limitOverride ?? economicLimitOf(settings, well.id).limit,
        horizonYears: settings.horizonYears,
        backgroundHeatFlowWPerM2: settings.backgroundHeatFlowWPerM2,
      })) as Wire<ForecastWellResponse>;
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      refused = e.reason;
    }
    const basis = forecast?.fit.basis ?? (well.kind === 'production' ? choice.basis : 'time');
    const series = refusedAsNull(() => toWire(services.wellSeries({ ...ref, basis })) as Wire<WellSeriesResponse>);
    const reservoirVersions = well.reservoir === null ? null
      : refusedAsNull(() => toWire(services.listReservoirVersions({ reservoir: well.reservoir as string, field: well.field })) as Wire<ListReservoirVersionsResponse>);
    return { well, forecast, refused, series, reservoirVersions, choice };
  }

  return {
    /** Gathers the data of a well or field report and builds its model; bad names are InputErrors. */
    buildModel(request: ReportRequest): ReportModel {
      const settingsStored = services.getSettings({});
      const settings: SettingsJson = request.units === undefined ? settingsStored : { ...settingsStored, units: request.units };
      const about = services.aboutFieldLog({});
      let scope: ReportScope;
      let field: FieldInfo;
      let wells: WellInfo[];
      if (request.well !== undefined) {
        const got = services.getWell({ well: request.well, ...(request.field !== undefined ? { field: request.field } : {}) });
        field = got.field;
        wells = [got.well];
        scope = { kind: 'well', well: got.well.name, field: got.field.name };
      } else {
        if (request.field === undefined) throw new InputError('name the well or the field to report on', { field: 'well' });
        const listed = services.listWells({ field: request.field }).fields[0];
        if (listed === undefined) throw new InputError(`no field named ${JSON.stringify(request.field)}`, { field: 'field' });
        const { wells: summaries, ...info } = listed;
        field = info;
        wells = summaries;
        scope = { kind: 'field', field: info.name };
      }
      const overview = refusedAsNull(() => (toWire(overviewOf(field.name)) as Wire<{ fields: FieldOverview[] }>).fields[0] ?? null);
      const sources = wells.map((w) => wellSources(w, settings, request.limit));
      return buildReportModel({
        scope,
        generatedAt: isoOf(fdb.now()),
        about: toWire(about) as typeof about,
        settings: toWire(settings) as Wire<SettingsJson>,
        field: toWire(field) as Wire<FieldInfo>,
        overview: overview as Wire<FieldOverview> | null,
        wells: sources,
        imports: importsOf(services),
        fingerprint: fingerprintOf(sources),
      });
    },

    /** The report as one HTML file with its code, styles and data inside, for any browser, offline. */
    renderReportHtml(model: ReportModel, render: { paper?: Paper } = {}): string {
      return assembleReportHtml(model, { paper: render.paper ?? 'a4', ...(options.pageFile !== undefined ? { pageFile: options.pageFile } : {}) });
    },

    /** The report as PDF bytes, printed by Chromium from the same HTML. */
    async renderReportPdf(model: ReportModel, render: { paper: Paper }): Promise<Buffer> {
      const html = assembleReportHtml(model, { paper: render.paper, ...(options.pageFile !== undefined ? { pageFile: options.pageFile } : {}) });
      return printPdf(html, { env: options.env ?? process.env });
    },
  };
}

export type ReportService = ReturnType<typeof createReportService>;

/** A lookup that may refuse (an InputError) gives null; anything else is a bug and is thrown. */
function refusedAsNull<T>(work: () => T): T | null {
  try {
    return work();
  } catch (e) {
    if (e instanceof InputError) return null;
    throw e;
  }
}

/** Every import of the field log (the model keeps the field's); null when there is no import history to read. */
function importsOf(services: TauwellServices): Wire<ImportRecordJson>[] | null {
  // A service layer put together without the CSV import has no listImports: the report says so rather than "none".
  if (typeof services.listImports !== 'function') return null;
  return refusedAsNull(() => toWire(services.listImports({ limit: IMPORTS_READ }).imports) as Wire<ImportRecordJson>[]);
}

/** SHA-256 over the stored fits' fingerprints (each itself a SHA-256 over the readings it used), in well order. */
function fingerprintOf(sources: readonly WellSources[]): string | null {
  const fitted = sources.filter((s) => s.forecast !== null);
  if (fitted.length === 0) return null;
  const hash = createHash('sha256');
  hash.update('tauwell-report-data 1\n');
  for (const s of fitted) hash.update(`${s.well.id} ${(s.forecast as Wire<ForecastWellResponse>).fit.stored.fingerprint}\n`);
  return hash.digest('hex');
}
