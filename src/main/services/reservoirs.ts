/** Reservoirs and their versioned parameters: add a version (a new row, never a rewrite), list them, evaluate the theory. */
import {
  ADD_RESERVOIR_VERSION_REQUEST, CREATE_RESERVOIR_REQUEST, RESERVOIR_REF, RESERVOIR_THEORY_REQUEST,
  type AddReservoirVersionRequest, type CreateReservoirRequest, type ListReservoirVersionsResponse, type ReservoirInfo,
  type ReservoirRef, type ReservoirTheoryRequest, type ReservoirTheoryResponse, type ReservoirVersionJson,
} from '../../shared/contract/reservoirs.js';
import { isoOf, validate } from '../../shared/contract/schema.js';
import { InputError } from '../../shared/errors.js';
import { parseReservoirParams, reservoirTheoryToJson } from '../../shared/reservoir/params.js';
import { reservoirTheory } from '../../shared/reservoir/theory.js';
import type { Reservoir, ReservoirVersion } from '../db/reservoirs.js';
import type { ServiceContext } from './context.js';

export function reservoirVersionJson(v: ReservoirVersion, reservoirName: string): ReservoirVersionJson {
  return {
    reservoir: reservoirName,
    version: v.version,
    params: JSON.parse(v.paramsJson),
    recordedAt: isoOf(v.recordedMs),
    recordedBy: v.recordedBy,
    note: v.note,
  };
}

export function reservoirServices(ctx: ServiceContext) {
  const info = (r: Reservoir): ReservoirInfo => ({
    id: r.id, name: r.name, field: ctx.fieldOf(r.fieldId).name, versions: ctx.reservoirs.listVersions(r.id).length,
  });

  const createTx = ctx.fdb.db.transaction((req: CreateReservoirRequest): ReservoirInfo => {
    const reservoir = ctx.reservoirs.create({ fieldId: ctx.field(req.field).id, name: req.name });
    ctx.audit.record({ who: ctx.who, action: 'create', entity: 'reservoir', entityId: reservoir.id, new: reservoir });
    return info(reservoir);
  });

  return {
    createReservoir(request: CreateReservoirRequest): ReservoirInfo {
      return createTx.immediate(validate(CREATE_RESERVOIR_REQUEST, request));
    },

    addReservoirVersion(request: AddReservoirVersionRequest): ReservoirVersionJson {
      const req = validate(ADD_RESERVOIR_VERSION_REQUEST, request);
      const { reservoir } = ctx.reservoir(req);
      // Evaluate the theory before storing, so a version whose water state is outside IAPWS-IF97 region 1 is refused now.
      try {
        reservoirTheory(parseReservoirParams(req.params));
      } catch (e) {
        if (e instanceof InputError) throw new InputError(e.reason, { field: e.where.field === undefined ? 'params' : `params.${e.where.field}` });
        throw e;
      }
      const version = ctx.reservoirs.addVersion(reservoir.id, { params: req.params, recordedBy: ctx.who, note: req.note ?? '' });
      ctx.audit.record({ who: ctx.who, action: 'add-version', entity: 'reservoir', entityId: reservoir.id, new: version, reason: req.note ?? '' });
      return reservoirVersionJson(version, reservoir.name);
    },

    listReservoirVersions(request: ReservoirRef): ListReservoirVersionsResponse {
      const { reservoir } = ctx.reservoir(validate(RESERVOIR_REF, request));
      return { reservoir: info(reservoir), versions: ctx.reservoirs.listVersions(reservoir.id).map((v) => reservoirVersionJson(v, reservoir.name)) };
    },

    reservoirTheory(request: ReservoirTheoryRequest): ReservoirTheoryResponse {
      const req = validate(RESERVOIR_THEORY_REQUEST, request);
      const { reservoir } = ctx.reservoir(req);
      const version = req.version === undefined ? ctx.reservoirs.latestVersion(reservoir.id) : ctx.reservoirs.getVersion(reservoir.id, req.version);
      if (version === undefined) {
        throw new InputError(req.version === undefined ? `${reservoir.name} has no parameter version yet` : `${reservoir.name} has no version ${req.version}`, { field: req.version === undefined ? 'reservoir' : 'version' });
      }
      const theory = reservoirTheory(parseReservoirParams(JSON.parse(version.paramsJson), `${reservoir.name} version ${version.version}`));
      return { reservoir: info(reservoir), version: reservoirVersionJson(version, reservoir.name), theory: reservoirTheoryToJson(theory) };
    },
  };
}
