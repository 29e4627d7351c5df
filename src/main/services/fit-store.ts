/**
 * Stored fits and what they were made from. A fit keeps a data fingerprint: SHA-256 over the
 * readings that entered it — each reading's id, instant, production temperature, normalised mass
 * flow, status and flags, the values a refit would read — and over the well's Tref and time zero,
 * the basis and the window. When any of these changes, the fingerprint no longer matches and the
 * stored fit is stale. Injection temperature, pressure and notes do not enter a fit, so editing
 * them leaves it current. The stored result keeps the fit's parameters, intervals, statistics and
 * messages, not its per-point x and residuals (services/fits.ts withoutResiduals): those follow
 * from the readings the fingerprint names, and a fit of a million readings would store a hundred
 * megabytes each time.
 */
import { toWire } from '../../shared/contract/channels.js';
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import type Database from 'better-sqlite3';
import type { Basis } from '../../shared/fit/types.js';
import type { FieldDb } from '../db/database.js';

export interface StoredFit {
  id: number;
  wellId: number;
  model: string;
  basis: Basis;
  windowFromMs: number | null;
  windowToMs: number | null;
  resultJson: string;
  fingerprint: string;
  engineVersion: string;
  createdMs: number;
}

export interface FingerprintInput {
  wellId: number;
  referenceTemperatureC: number;
  originMs: number;
  basis: Basis;
  windowFromMs: number | null;
  windowToMs: number | null;
  readings: readonly {
    id: number; timeMs: number; productionTemperatureC: number | null; normalisedMassFlowKgPerS: number | null;
    status: string; flags: readonly string[];
  }[];
}

interface FitRow {
  id: number;
  well_id: number;
  model: string;
  basis: Basis;
  window_from_ms: number | null;
  window_to_ms: number | null;
  result_json: string;
  data_fingerprint: string;
  engine_version: string;
  created_ms: number;
}

export class FitStore {
  private readonly insertRow: Database.Statement<[number, string, string, number | null, number | null, string, string, string, number]>;
  private readonly byId: Database.Statement<[number], FitRow>;
  private readonly latestRow: Database.Statement<[number], FitRow>;

  constructor(fdb: FieldDb) {
    this.insertRow = fdb.db.prepare(
      `INSERT INTO fits (well_id, model, basis, window_from_ms, window_to_ms, result_json, data_fingerprint, engine_version, created_ms)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)`,
    );
    this.byId = fdb.db.prepare('SELECT * FROM fits WHERE id = ?');
    this.latestRow = fdb.db.prepare('SELECT * FROM fits WHERE well_id = ? ORDER BY created_ms DESC, id DESC LIMIT 1');
  }

  insert(fit: Omit<StoredFit, 'id'>): StoredFit {
    const id = Number(this.insertRow.run(
      fit.wellId, fit.model, fit.basis, fit.windowFromMs, fit.windowToMs, fit.resultJson, fit.fingerprint, fit.engineVersion, fit.createdMs,
    ).lastInsertRowid);
    return toStored(this.byId.get(id) as FitRow);
  }

  latest(wellId: number): StoredFit | undefined {
    const row = this.latestRow.get(wellId);
    return row === undefined ? undefined : toStored(row);
  }
}

/** Numbers by their shortest round-trip text, so the same doubles always hash the same. */
export function dataFingerprint(input: FingerprintInput): string {
  const hash = createHash('sha256');
  const text = (v: number | null): string => (v === null ? '-' : String(v));
  hash.update(`tauwell-fit-data 1|well ${input.wellId}|tref ${text(input.referenceTemperatureC)}|origin ${input.originMs}|basis ${input.basis}|window ${text(input.windowFromMs)} ${text(input.windowToMs)}\n`);
  // The same bytes as one update a reading, handed over a few thousand readings at a time (an
  // update per reading costs more than its hashing).
  let chunk = '';
  let inChunk = 0;
  for (const r of input.readings) {
    chunk += `${r.id}|${r.timeMs}|${text(r.productionTemperatureC)}|${text(r.normalisedMassFlowKgPerS)}|${r.status}|${r.flags.join(',')}\n`;
    if (++inChunk === 4096) {
      hash.update(chunk);
      chunk = '';
      inChunk = 0;
    }
  }
  hash.update(chunk);
  return hash.digest('hex');
}

let version: string | undefined;

/** The engine that made a fit: the package version, from package.json three folders up (src/ and dist/ alike). */
export function engineVersion(): string {
  if (version === undefined) {
    try {
      const json = JSON.parse(readFileSync(new URL('../../../package.json', import.meta.url), 'utf8')) as { version?: unknown };
      version = `tauwell ${typeof json.version === 'string' ? json.version : 'unknown'}`;
    } catch {
      version = 'tauwell unknown';
    }
  }
  return version;
}

/** A fit record as stored JSON: the transports' encoding (non-finite numbers → null, typed arrays → arrays). */
export function resultJsonText(value: unknown): string {
  return JSON.stringify(toWire(value));
}

function toStored(r: FitRow): StoredFit {
  return {
    id: r.id,
    wellId: r.well_id,
    model: r.model,
    basis: r.basis,
    windowFromMs: r.window_from_ms,
    windowToMs: r.window_to_ms,
    resultJson: r.result_json,
    fingerprint: r.data_fingerprint,
    engineVersion: r.engine_version,
    createdMs: r.created_ms,
  };
}
