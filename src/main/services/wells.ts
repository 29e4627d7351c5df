/** Fields and wells: list them with each well's latest live reading; create a field or a well; change a well. */
import { instantMs, validate } from '../../shared/contract/schema.js';
import {
  CREATE_FIELD_REQUEST, CREATE_WELL_REQUEST, LIST_WELLS_REQUEST, UPDATE_WELL_REQUEST, WELL_REF,
  type CreateFieldRequest, type CreateWellRequest, type FieldInfo, type GetWellResponse, type ListWellsRequest,
  type ListWellsResponse, type UpdateWellRequest, type WellInfo, type WellRef,
} from '../../shared/contract/wells.js';
import type { Reading } from '../db/readings.js';
import type { WellChanges } from '../db/wells.js';
import type { ServiceContext } from './context.js';
import { fieldInfo, readingJson, wellInfo } from './views.js';

export function wellServices(ctx: ServiceContext) {
  const db = ctx.fdb.db;
  const latest = db.prepare<[number], { id: number }>(
    'SELECT id FROM readings WHERE well_id = ? AND deleted_ms IS NULL ORDER BY time_ms DESC LIMIT 1',
  );
  const liveCount = db.prepare<[number], { n: number }>('SELECT count(*) AS n FROM readings WHERE well_id = ? AND deleted_ms IS NULL');

  const createFieldTx = db.transaction((req: CreateFieldRequest): FieldInfo => {
    const field = ctx.fields.create({ name: req.name, ...(req.timeZone !== undefined ? { timeZone: req.timeZone } : {}), notes: req.notes ?? '' });
    ctx.audit.record({ who: ctx.who, action: 'create', entity: 'field', entityId: field.id, new: field });
    return fieldInfo(field);
  });

  const createWellTx = db.transaction((req: CreateWellRequest): WellInfo => {
    const field = ctx.field(req.field);
    const reservoirId = req.reservoir === undefined ? null : ctx.reservoir({ reservoir: req.reservoir, field: field.name }).reservoir.id;
    const well = ctx.wells.create({
      fieldId: field.id,
      name: req.name,
      kind: req.kind,
      reservoirId,
      referenceTemperatureC: req.referenceTemperatureC ?? null,
      productionStartMs: req.productionStart === undefined ? null : instantMs(req.productionStart),
    });
    ctx.audit.record({ who: ctx.who, action: 'create', entity: 'well', entityId: well.id, new: well });
    return wellInfo(ctx, well);
  });

  return {
    listWells(request: ListWellsRequest = {}): ListWellsResponse {
      const req = validate(LIST_WELLS_REQUEST, request);
      const fields = req.field === undefined ? ctx.fields.list() : [ctx.field(req.field)];
      return {
        fields: fields.map((f) => ({
          ...fieldInfo(f),
          wells: ctx.wells.listByField(f.id).map((w) => {
            const id = latest.get(w.id)?.id;
            const reading = id === undefined ? null : (ctx.readings.get(id) as Reading);
            return {
              ...wellInfo(ctx, w),
              liveReadings: (liveCount.get(w.id) as { n: number }).n,
              latestReading: reading === null ? null : readingJson(reading, w.name),
            };
          }),
        })),
      };
    },

    getWell(request: WellRef): GetWellResponse {
      const { well, field } = ctx.well(validate(WELL_REF, request));
      return { well: wellInfo(ctx, well), field: fieldInfo(field) };
    },

    createField(request: CreateFieldRequest): FieldInfo {
      return createFieldTx.immediate(validate(CREATE_FIELD_REQUEST, request));
    },

    createWell(request: CreateWellRequest): WellInfo {
      return createWellTx.immediate(validate(CREATE_WELL_REQUEST, request));
    },

    updateWell(request: UpdateWellRequest): WellInfo {
      const req = validate(UPDATE_WELL_REQUEST, request);
      const { well, field } = ctx.well(req);
      const changes: WellChanges = {};
      if (req.referenceTemperatureC !== undefined) changes.referenceTemperatureC = req.referenceTemperatureC;
      if (req.productionStart !== undefined) changes.productionStartMs = req.productionStart === null ? null : instantMs(req.productionStart);
      if (req.reservoir !== undefined) {
        changes.reservoirId = req.reservoir === null ? null : ctx.reservoir({ reservoir: req.reservoir, field: field.name }).reservoir.id;
      }
      return wellInfo(ctx, ctx.wells.update(well.id, changes, { who: ctx.who, reason: req.reason ?? '' }));
    },
  };
}
