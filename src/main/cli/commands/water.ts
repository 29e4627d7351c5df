/** `tauwell water`: liquid-water properties from IAPWS-IF97 region 1 at a temperature and pressure. */
import { InputError } from '../../../shared/errors.js';
import { liquidWater, saturationPressurePa } from '../../../shared/water/iapws97.js';
import { toSI } from '../../../shared/units.js';
import type { CommandSpec, ParsedArgs } from '../args.js';
import { num, withUnit } from '../display.js';
import type { CliIo } from '../io.js';
import { toJsonText } from '../json.js';
import { renderTable } from '../table.js';

export const WATER_COMMAND: CommandSpec = {
  name: 'water',
  summary: 'Density, enthalpy, isobaric specific heat and saturation pressure of liquid water (IAPWS-IF97 region 1: 0–350 °C, saturation pressure to 100 MPa).',
  usage: 'tauwell water --temperature C --pressure MPa [--json]',
  options: [
    { name: 'temperature', kind: 'value', placeholder: 'C', required: true, help: 'water temperature in °C' },
    { name: 'pressure', kind: 'value', placeholder: 'MPa', required: true, help: 'absolute pressure in MPa (not gauge)' },
    { name: 'json', kind: 'flag', help: 'print JSON (SI units: kg/m3, J/kg, J/(kg K), Pa)' },
  ],
  notes: ['States outside region 1 (steam, or above 350 °C) are reported as errors, never extrapolated.'],
};

export function runWater(args: ParsedArgs, io: CliIo): number {
  const temperatureC = args.requireNumber('temperature');
  const pressureMPa = args.requireNumber('pressure');
  const temperatureK = toSI(temperatureC, 'degC', 'temperature', '--temperature');
  const pressurePa = toSI(pressureMPa, 'MPa', 'pressure', '--pressure');
  let water: ReturnType<typeof liquidWater>;
  let psPa: number;
  try {
    water = liquidWater(temperatureK, pressurePa);
    psPa = saturationPressurePa(temperatureK);
  } catch (e) {
    // The engine names 'temperature' or 'pressure'; the user typed the option.
    if (e instanceof InputError) throw new InputError(e.reason, { field: `--${e.where.field ?? 'temperature'}` });
    throw e;
  }
  const json = {
    density: { value: water.densityKgPerM3, unit: 'kg/m3' },
    enthalpy: { value: water.specificEnthalpyJPerKg, unit: 'J/kg' },
    specificHeat: { value: water.specificHeatJPerKgK, unit: 'J/(kg K)' },
    saturationPressure: { value: psPa, unit: 'Pa' },
  };
  if (args.flag('json')) {
    io.stdout.write(toJsonText(json));
    return 0;
  }
  const rows = [
    ['density ρ', withUnit(water.densityKgPerM3, 'kg/m3', 7), ''],
    ['specific enthalpy h', withUnit(water.specificEnthalpyJPerKg, 'J/kg', 7), withUnit(water.specificEnthalpyJPerKg / 1e3, 'kJ/kg', 7)],
    ['isobaric specific heat cp', withUnit(water.specificHeatJPerKgK, 'J/(kg K)', 7), withUnit(water.specificHeatJPerKgK / 1e3, 'kJ/(kg K)', 7)],
    ['saturation pressure ps(T)', withUnit(psPa, 'Pa', 7), withUnit(psPa / 1e6, 'MPa', 7)],
  ];
  io.stdout.write([
    `tauwell water: ${num(temperatureC, 7)} °C (${num(temperatureK, 8)} K), ${num(pressureMPa, 7)} MPa — IAPWS-IF97 (2007) region 1`,
    '',
    ...renderTable(['property', 'value (SI)', 'everyday units'], rows, ['left', 'right', 'right']),
  ].join('\n') + '\n');
  return 0;
}
