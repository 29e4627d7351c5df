/**
 * The one service layer over a field log: every front end (command line, desktop shell, loopback
 * server) calls these methods, each of which checks its request with the contract's schema
 * (src/shared/contract) and returns the contract's response type.
 *
 *   createServices(fdb: FieldDb, options?: { who?: string; now?: () => number }): Services
 */
import { REQUEST_SCHEMAS, type TauwellServices } from '../../shared/contract/index.js';
import { validate } from '../../shared/contract/schema.js';
import type { FieldDb } from '../db/database.js';
import { createContext, type ServiceOptions } from './context.js';
import { buildDemo } from './demo.js';
import { exportServices } from './exports.js';
import { fitServices } from './fits.js';
import { forecastServices } from './forecasts.js';
import { readingServices } from './readings.js';
import { reservoirServices } from './reservoirs.js';
import { wellServices } from './wells.js';

export type Services = TauwellServices;
export type { ServiceOptions } from './context.js';

export function createServices(fdb: FieldDb, options: ServiceOptions = {}): Services {
  const ctx = createContext(fdb, options);
  const fits = fitServices(ctx);
  const services: TauwellServices = {
    ...wellServices(ctx),
    ...readingServices(ctx),
    ...exportServices(ctx),
    fitWell: fits.fitWell,
    fitStatus: fits.fitStatus,
    ...forecastServices(ctx, fits),
    ...reservoirServices(ctx),
    buildDemo: (request = {}) => {
      validate(REQUEST_SCHEMAS.buildDemo, request);
      return buildDemo(fdb);
    },
    // CSV import: spread the methods of ./imports.ts here (and add them to TauwellServices and REQUEST_SCHEMAS).
  };
  return services;
}
