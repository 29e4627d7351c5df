/**
 * The one service interface behind every front end (command line, desktop, loopback server): each
 * method takes a request that its schema below checks, and returns the response type. A transport
 * looks the schema up by method name, so an untrusted payload is checked before anything runs.
 */
import type { BuildDemoResponse } from './demo.js';
import { EXPORT_REQUEST, type ExportRequest, type ExportResponse } from './exports.js';
import {
  ECONOMIC_LIMIT, FIT_STATUS_REQUEST, FIT_WELL_REQUEST, FORECAST_WELL_REQUEST,
  type FitStatusResponse, type FitWellRequest, type FitWellResponse, type ForecastWellRequest, type ForecastWellResponse,
} from './fits.js';
import {
  BEGIN_UPLOAD_REQUEST, GET_IMPORT_REQUEST, IMPORT_JOB_REF, IMPORT_PROFILE_REF, LIST_CONFLICTS_REQUEST, LIST_IMPORT_PROFILES_REQUEST,
  LIST_IMPORTS_REQUEST, PREVIEW_IMPORT_REQUEST, RESOLVE_CONFLICTS_REQUEST, SAVE_IMPORT_PROFILE_REQUEST, STAGED_FILE_REF,
  START_IMPORT_REQUEST, UPLOAD_CHUNK_REQUEST,
  type BeginUploadRequest, type BeginUploadResponse, type GetImportRequest, type ImportJobJson, type ImportJobRef,
  type ImportProfileJson, type ImportProfileRef, type ImportRecordJson, type ListConflictsRequest, type ListConflictsResponse,
  type ListImportProfilesResponse, type ListImportsRequest, type ListImportsResponse, type PreviewImportRequest,
  type PreviewImportResponse, type ResolveConflictsRequest, type ResolveConflictsResponse, type SaveImportProfileRequest,
  type StagedFileJson, type StagedFileRef, type StartImportRequest, type UploadChunkRequest, type UploadChunkResponse,
} from './imports.js';
import {
  CHART_SERIES_REQUEST, FIELD_OVERVIEW_REQUEST, WELL_SERIES_REQUEST,
  type ChartSeriesResponse, type FieldOverviewRequest, type FieldOverviewResponse, type WellSeriesRequest, type WellSeriesResponse,
} from './overview.js';
import {
  ABOUT_FIELD_LOG_REQUEST, GET_SETTINGS_REQUEST, updateSettingsRequest, type AboutFieldLogJson, type SettingsJson, type UpdateSettingsRequest,
} from './settings.js';
import {
  AUDIT_REQUEST, DELETE_READING_REQUEST, EDIT_READING_REQUEST, GET_READING_REQUEST, LIST_READINGS_REQUEST, LOG_READING_REQUEST,
  type AuditRequest, type AuditResponse, type DeleteReadingRequest, type DeleteReadingResponse, type EditReadingRequest,
  type GetReadingRequest, type GetReadingResponse,
  type EditReadingResponse, type ListReadingsRequest, type ListReadingsResponse, type LogReadingRequest, type LogReadingResponse,
} from './readings.js';
import {
  ADD_RESERVOIR_VERSION_REQUEST, CREATE_RESERVOIR_REQUEST, RESERVOIR_REF, RESERVOIR_THEORY_REQUEST,
  type AddReservoirVersionRequest, type CreateReservoirRequest, type ListReservoirVersionsResponse, type ReservoirInfo,
  type ReservoirRef, type ReservoirTheoryRequest, type ReservoirTheoryResponse, type ReservoirVersionJson,
} from './reservoirs.js';
import { MAKE_REPORT_REQUEST, type MakeReportRequest, type MakeReportResponse } from './reports.js';
import { object, type Schema } from './schema.js';
import {
  CREATE_FIELD_REQUEST, CREATE_WELL_REQUEST, LIST_WELLS_REQUEST, UPDATE_WELL_REQUEST, WELL_REF,
  type CreateFieldRequest, type CreateWellRequest, type FieldInfo, type GetWellResponse, type ListWellsRequest,
  type ListWellsResponse, type UpdateWellRequest, type WellInfo, type WellRef,
} from './wells.js';

export interface TauwellServices {
  // fields and wells
  listWells(request?: ListWellsRequest): ListWellsResponse;
  getWell(request: WellRef): GetWellResponse;
  createField(request: CreateFieldRequest): FieldInfo;
  createWell(request: CreateWellRequest): WellInfo;
  updateWell(request: UpdateWellRequest): WellInfo;
  // readings and the audit log
  logReading(request: LogReadingRequest): LogReadingResponse;
  editReading(request: EditReadingRequest): EditReadingResponse;
  deleteReading(request: DeleteReadingRequest): DeleteReadingResponse;
  /** A reading by id, live or deleted. */
  getReading(request: GetReadingRequest): GetReadingResponse;
  listReadings(request: ListReadingsRequest): ListReadingsResponse;
  auditLog(request?: AuditRequest): AuditResponse;
  // exports
  exportData(request: ExportRequest): ExportResponse;
  // fits and forecasts
  fitWell(request: FitWellRequest): FitWellResponse;
  fitStatus(request: WellRef): FitStatusResponse;
  forecastWell(request: ForecastWellRequest): ForecastWellResponse;
  // reservoirs
  createReservoir(request: CreateReservoirRequest): ReservoirInfo;
  addReservoirVersion(request: AddReservoirVersionRequest): ReservoirVersionJson;
  listReservoirVersions(request: ReservoirRef): ListReservoirVersionsResponse;
  reservoirTheory(request: ReservoirTheoryRequest): ReservoirTheoryResponse;
  // the invented demo field
  buildDemo(request?: Record<string, never>): BuildDemoResponse;
  // settings of the field log (display units, zone, economic limits, background heat flow)
  getSettings(request?: Record<string, never>): SettingsJson;
  updateSettings(request: UpdateSettingsRequest): SettingsJson;
  aboutFieldLog(request?: Record<string, never>): AboutFieldLogJson;
  // what the screens show at a glance
  fieldOverview(request?: FieldOverviewRequest): FieldOverviewResponse;
  wellSeries(request: WellSeriesRequest): WellSeriesResponse;
  chartSeries(request: WellSeriesRequest): ChartSeriesResponse;
  // CSV import: a staged copy of the user's file, its preview, the import as a job, its records
  beginUpload(request: BeginUploadRequest): BeginUploadResponse;
  uploadChunk(request: UploadChunkRequest): UploadChunkResponse;
  finishUpload(request: StagedFileRef): StagedFileJson;
  previewImport(request: PreviewImportRequest): PreviewImportResponse | Promise<PreviewImportResponse>;
  startImport(request: StartImportRequest): ImportJobJson;
  importJob(request: ImportJobRef): ImportJobJson;
  cancelImport(request: ImportJobRef): ImportJobJson;
  listImports(request?: ListImportsRequest): ListImportsResponse;
  getImport(request: GetImportRequest): ImportRecordJson;
  listConflicts(request?: ListConflictsRequest): ListConflictsResponse;
  resolveConflicts(request: ResolveConflictsRequest): ResolveConflictsResponse;
  saveImportProfile(request: SaveImportProfileRequest): ImportProfileJson;
  loadImportProfile(request: ImportProfileRef): ImportProfileJson;
  listImportProfiles(request?: Record<string, never>): ListImportProfilesResponse;
  // the offline decline report, for the front end to save
  makeReport(request: MakeReportRequest): Promise<MakeReportResponse>;
}

export type ServiceName = keyof TauwellServices;

/** The request schema of every service method, for transports that receive untrusted payloads. */
export const REQUEST_SCHEMAS: { readonly [K in ServiceName]: Schema<unknown> } = {
  listWells: LIST_WELLS_REQUEST,
  getWell: WELL_REF,
  createField: CREATE_FIELD_REQUEST,
  createWell: CREATE_WELL_REQUEST,
  updateWell: UPDATE_WELL_REQUEST,
  logReading: LOG_READING_REQUEST,
  editReading: EDIT_READING_REQUEST,
  deleteReading: DELETE_READING_REQUEST,
  getReading: GET_READING_REQUEST,
  listReadings: LIST_READINGS_REQUEST,
  auditLog: AUDIT_REQUEST,
  exportData: EXPORT_REQUEST,
  fitWell: FIT_WELL_REQUEST,
  fitStatus: FIT_STATUS_REQUEST,
  forecastWell: FORECAST_WELL_REQUEST,
  createReservoir: CREATE_RESERVOIR_REQUEST,
  addReservoirVersion: ADD_RESERVOIR_VERSION_REQUEST,
  listReservoirVersions: RESERVOIR_REF,
  reservoirTheory: RESERVOIR_THEORY_REQUEST,
  buildDemo: object({}),
  getSettings: GET_SETTINGS_REQUEST,
  updateSettings: updateSettingsRequest(ECONOMIC_LIMIT),
  aboutFieldLog: ABOUT_FIELD_LOG_REQUEST,
  fieldOverview: FIELD_OVERVIEW_REQUEST,
  wellSeries: WELL_SERIES_REQUEST,
  chartSeries: CHART_SERIES_REQUEST,
  beginUpload: BEGIN_UPLOAD_REQUEST,
  uploadChunk: UPLOAD_CHUNK_REQUEST,
  finishUpload: STAGED_FILE_REF,
  previewImport: PREVIEW_IMPORT_REQUEST,
  startImport: START_IMPORT_REQUEST,
  importJob: IMPORT_JOB_REF,
  cancelImport: IMPORT_JOB_REF,
  listImports: LIST_IMPORTS_REQUEST,
  getImport: GET_IMPORT_REQUEST,
  listConflicts: LIST_CONFLICTS_REQUEST,
  resolveConflicts: RESOLVE_CONFLICTS_REQUEST,
  saveImportProfile: SAVE_IMPORT_PROFILE_REQUEST,
  loadImportProfile: IMPORT_PROFILE_REF,
  listImportProfiles: LIST_IMPORT_PROFILES_REQUEST,
  makeReport: MAKE_REPORT_REQUEST,
};
