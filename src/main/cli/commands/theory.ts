/** `tauwell theory`: the lumped reservoir model's heat, time constant and power from a parameter file. */
import { InputError } from '../../../shared/errors.js';
import { parseReservoirParams, reservoirTheoryToJson } from '../../../shared/reservoir/params.js';
import { reservoirTheory, type ReservoirParams, type ReservoirTheory } from '../../../shared/reservoir/theory.js';
import type { CommandSpec, ParsedArgs } from '../args.js';
import { celsius, heat, megawatts, num, withUnit, years } from '../display.js';
import type { CliIo } from '../io.js';
import { toJsonText } from '../json.js';
import { readJsonFile } from '../read-file.js';
import { renderTable } from '../table.js';

export const PARAMS_FILE_NOTE =
  'Parameter file (JSON): {"kind":"hot-dry-rock"|"aquifer", "surfaceTemperature": °C, "gradient": K/m, "minUsefulTemperature": °C, ' +
  '"maxDepth": m (hot-dry-rock) or "depth": m, "thickness": m, "porosity": 0–1 (aquifer), "area": m², "rockDensity": kg/m³, ' +
  '"rockSpecificHeat": J/(kg·K), "massFlow": kg/s or "volumeFlow": m³/s, ' +
  '"fluid": {"density": kg/m³, "specificHeat": J/(kg·K)} or {"iapws": {"temperature": °C, "pressure": MPa}}}.';

export const THEORY_COMMAND: CommandSpec = {
  name: 'theory',
  summary: 'Theoretical heat in place, time constant τ = C/(ṁ·cw) and initial power of a hot-dry-rock slab or a hot aquifer.',
  usage: 'tauwell theory --params FILE.json [--json]',
  options: [
    { name: 'params', kind: 'value', placeholder: 'FILE.json', required: true, help: 'reservoir parameters (JSON, units as below)' },
    { name: 'json', kind: 'flag', help: 'print JSON (SI units: m, K, J/K, J, s, W, kg/s, kg)' },
  ],
  notes: [PARAMS_FILE_NOTE],
};

/** Reads, checks and evaluates a parameter file; every error names the file. */
export function loadTheory(file: string, cwd: string): { params: ReservoirParams; theory: ReservoirTheory } {
  const params = parseReservoirParams(readJsonFile(file, cwd), file);
  try {
    return { params, theory: reservoirTheory(params) };
  } catch (e) {
    // Water-property errors come without the file; put it back so the user knows where to look.
    if (e instanceof InputError && e.where.file === undefined) throw new InputError(e.reason, { ...e.where, file });
    throw e;
  }
}

export function runTheory(args: ParsedArgs, io: CliIo): number {
  const file = args.requireString('params');
  const { theory } = loadTheory(file, io.cwd);
  if (args.flag('json')) {
    io.stdout.write(toJsonText(reservoirTheoryToJson(theory)));
    return 0;
  }
  io.stdout.write([`tauwell theory: ${file} (${theory.kind})`, '', ...theoryLines(theory)].join('\n') + '\n');
  return 0;
}

export function theoryLines(t: ReservoirTheory): string[] {
  const fluid = t.fluid.source === 'fixed' ? 'as given' : `IAPWS-IF97 region 1 at ${celsius(t.fluid.temperatureK)}, ${num((t.fluid.pressurePa ?? NaN) / 1e6)} MPa`;
  const rows = [
    ['minimum useful depth z1', withUnit(t.minUsefulDepthM, 'm'), withUnit(t.minUsefulDepthM / 1000, 'km', 4)],
    ['bottom temperature T2', withUnit(t.bottomTemperatureK, 'K'), celsius(t.bottomTemperatureK)],
    ['mean available temperature θ0', withUnit(t.theta0K, 'K'), ''],
    ['heat capacity C', withUnit(t.heatCapacityJPerK, 'J/K'), ''],
    ['useful heat E0 = C·θ0', withUnit(t.usefulHeatJ, 'J'), heat(t.usefulHeatJ)],
    ['time constant τ = C/(ṁ·cw)', withUnit(t.tauS, 's'), years(t.tauS, 5)],
    ['initial power P0 = ṁ·cw·θ0', withUnit(t.initialPowerW, 'W'), megawatts(t.initialPowerW, 5)],
    ['mass flow ṁ', withUnit(t.massFlowKgPerS, 'kg/s'), ''],
    ['characteristic mass Mc = C/cw', withUnit(t.characteristicMassKg, 'kg'), ''],
    ['fluid density ρw', withUnit(t.fluid.densityKgPerM3, 'kg/m3'), fluid],
    ['fluid specific heat cw', withUnit(t.fluid.specificHeatJPerKgK, 'J/(kg K)'), fluid],
  ];
  return renderTable(['quantity', 'value (SI)', 'everyday units'], rows, ['left', 'right', 'left']);
}
