/**
 * Contract of exports: readings, rejected import rows, import conflicts and the audit log, as CSV
 * (a header row; values in SI and °C with the unit in each header) or as JSON.
 */
import { boolean, instant, number, object, oneOf, optional, string, type Schema } from './schema.js';

export type ExportKind = 'readings' | 'rejected' | 'conflicts' | 'audit';
export const EXPORT_KINDS: readonly ExportKind[] = ['readings', 'rejected', 'conflicts', 'audit'];
export type ExportFormat = 'csv' | 'json';
export const EXPORT_FORMATS: readonly ExportFormat[] = ['csv', 'json'];

export interface ExportRequest {
  kind: ExportKind;
  /** Default csv. */
  format?: ExportFormat;
  /** readings: one well (default every well of the field log). */
  well?: string;
  field?: string;
  /** rejected, conflicts: one import (default all). */
  importId?: number;
  /** readings, audit: inclusive bounds. */
  from?: string;
  to?: string;
  /** readings: include soft-deleted ones. */
  includeDeleted?: boolean;
}

export interface ExportResponse {
  kind: ExportKind;
  format: ExportFormat;
  mediaType: 'text/csv' | 'application/json';
  suggestedFileName: string;
  /** Data rows (CSV: without the header). */
  rowCount: number;
  /** The CSV header names (JSON rows are the contract objects: ReadingJson, AuditEntryJson, …). */
  columns: string[];
  text: string;
}

export const EXPORT_REQUEST: Schema<ExportRequest> = object({
  kind: oneOf(EXPORT_KINDS),
  format: optional(oneOf(EXPORT_FORMATS)),
  well: optional(string({ maxLength: 200 })),
  field: optional(string({ maxLength: 200 })),
  importId: optional(number({ integer: true, min: 1 })),
  from: optional(instant()),
  to: optional(instant()),
  includeDeleted: optional(boolean()),
});
