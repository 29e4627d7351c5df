/**
 * Contract of the offline decline report as a front end asks for it: a well's or a field's report
 * as a self-contained HTML page or a PDF, returned as bytes for the front end to save (the desktop
 * window's save dialog, a browser download). The command line writes the same report to a file.
 */
import { DISPLAY_UNITS, type DisplayUnits } from './settings.js';
import { object, oneOf, optional, string, type Schema } from './schema.js';

export type ReportFormat = 'html' | 'pdf';
export type ReportPaper = 'a4' | 'letter';

export interface MakeReportRequest {
  /** A well's report; with `field` only to tell wells of the same name apart. */
  well?: string;
  /** A field's report when no well is named. */
  field?: string;
  format: ReportFormat;
  /** Default a4. */
  paper?: ReportPaper;
  /** Default: the settings' display units. */
  units?: DisplayUnits;
}

export interface MakeReportResponse {
  /** A name to offer in the save dialog, e.g. "tauwell-KR-3-2026-12-02.pdf". */
  suggestedFileName: string;
  mediaType: 'text/html' | 'application/pdf';
  /** The report's bytes, base64. */
  base64: string;
  sizeBytes: number;
  generatedAt: string;
}

export const MAKE_REPORT_REQUEST = object({
  well: optional(string({ maxLength: 200 })),
  field: optional(string({ maxLength: 200 })),
  format: oneOf<ReportFormat>(['html', 'pdf']),
  paper: optional(oneOf<ReportPaper>(['a4', 'letter'])),
  units: optional(oneOf(DISPLAY_UNITS)),
}) as Schema<MakeReportRequest>;
