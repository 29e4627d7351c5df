/**
 * The one service layer over a field log: every front end (command line, desktop shell, loopback
 * server) calls these methods, each of which checks its request with the contract's schema
 * (src/shared/contract) and returns the contract's response type.
 *
 *   createServices(fdb: FieldDb, options?: { who?, now?, nativeBinding?, stagingDir?, parallelReads? }): Services
 *   closeServices(services): Promise<void>   cancels a running import, removes staged uploads
 *
 * The services object holds exactly the contract's methods (REQUEST_SCHEMAS), so that what a
 * transport can reach is what the contract lists; what else belongs to it (the import jobs'
 * connection and staging folder) is closed through closeServices.
 */
import { REQUEST_SCHEMAS, type TauwellServices } from '../../shared/contract/index.js';
import type { MakeReportRequest } from '../../shared/contract/reports.js';
import { validate } from '../../shared/contract/schema.js';
import type { FieldDb } from '../db/database.js';
import { createContext, type ServiceOptions } from './context.js';
import { buildDemo } from './demo.js';
import { exportServices } from './exports.js';
import { fitServices } from './fits.js';
import { createImportApi, guardBusyWrites } from './import-api.js';
import { forecastServices } from './forecasts.js';
import { overviewServices } from './overview.js';
import { readingServices } from './readings.js';
import { createReportService } from './report.js';
import { reservoirServices } from './reservoirs.js';
import { settingsServices } from './settings.js';
import { ColumnReader } from './column-reader.js';
import { wellSeriesServices } from './well-series.js';
import { wellServices } from './wells.js';

export type Services = TauwellServices;
export type { ServiceOptions } from './context.js';

export interface CreateServicesOptions extends ServiceOptions {
  /** The SQLite addon the import jobs' second connection loads (the desktop shell's Electron build). */
  nativeBinding?: string;
  /** Where uploaded files are staged; default a private folder under the system's temporary folder. */
  stagingDir?: string;
  /**
   * Read long series with two reader threads (services/column-reader.ts): for the long-running front ends (the
   * loopback server, the desktop shell); a command that runs once does not need the threads.
   */
  parallelReads?: boolean;
}

const closers = new WeakMap<TauwellServices, () => Promise<void>>();

export function createServices(fdb: FieldDb, options: CreateServicesOptions = {}): Services {
  const ctx = createContext(fdb, options);
  const { close: closeImports, importing, ...importApi } = createImportApi(fdb, options);
  const fits = fitServices(ctx);
  const forecasts = forecastServices(ctx, fits);
  const columnReader = options.parallelReads === true ? new ColumnReader(fdb, options.nativeBinding) : null;
  const services: TauwellServices = {
    ...wellServices(ctx),
    ...readingServices(ctx),
    ...exportServices(ctx),
    fitWell: fits.fitWell,
    fitStatus: fits.fitStatus,
    forecastWell: forecasts.forecastWell,
    ...reservoirServices(ctx),
    buildDemo: (request = {}) => {
      validate(REQUEST_SCHEMAS.buildDemo, request);
      return buildDemo(fdb);
    },
    ...settingsServices(ctx),
    fieldOverview: overviewServices(ctx, fits, forecasts).fieldOverview,
    ...wellSeriesServices(ctx, columnReader),
    ...importApi,
    makeReport: async (request) => {
      const req = validate(REQUEST_SCHEMAS.makeReport, request) as MakeReportRequest;
      const model = reports.buildModel({
        ...(req.well !== undefined ? { well: req.well } : {}),
        ...(req.field !== undefined ? { field: req.field } : {}),
        ...(req.units !== undefined ? { units: req.units } : {}),
      });
      const paper = req.paper ?? 'a4';
      const bytes = req.format === 'pdf'
        ? await reports.renderReportPdf(model, { paper })
        : Buffer.from(reports.renderReportHtml(model, { paper }), 'utf8');
      const subject = (req.well ?? req.field ?? 'field').replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '');
      return {
        suggestedFileName: `tauwell-${subject}-${model.meta.generatedAt.slice(0, 10)}.${req.format}`,
        mediaType: req.format === 'pdf' ? 'application/pdf' : 'text/html',
        base64: bytes.toString('base64'),
        sizeBytes: bytes.length,
        generatedAt: model.meta.generatedAt,
      };
    },
  };
  // The report gathers its data through these very services, as a screen would.
  const reports = createReportService(services, fdb);
  // A write on this connection while an import job holds the write lock is refused in plain words.
  const guarded = guardBusyWrites(services, importing);
  closers.set(guarded, async () => {
    await columnReader?.close();
    await closeImports();
  });
  return guarded;
}

/** Releases what the services hold besides the field log itself (which its opener closes). */
export async function closeServices(services: TauwellServices): Promise<void> {
  await closers.get(services)?.();
  closers.delete(services);
}
