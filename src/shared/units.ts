/**
 * Conversion between the units people log and type and the SI units the engine computes in.
 * Used only at the edges (import, command line, forms, reports); everything inside is SI.
 *
 * Factors are exact by definition unless noted, after NIST SP 811 (2008), Appendix B.8,
 * and the definitions it rests on: inch = 0.0254 m, foot = 0.3048 m, pound = 0.45359237 kg,
 * standard gravity = 9.80665 m/s², US gallon = 231 in³, petroleum barrel = 42 US gal.
 */
import { InputError, requirePositive } from './errors.js';

export type Quantity =
  | 'temperature'
  | 'temperatureDifference'
  | 'massFlow'
  | 'volumeFlow'
  | 'pressure'
  | 'length'
  | 'area'
  | 'energy'
  | 'power'
  | 'time';

export interface UnitDef {
  /** Canonical name, as listed by unitsOf(). */
  symbol: string;
  quantity: Quantity;
  /** Other accepted spellings. */
  aliases: readonly string[];
  toSI(v: number): number;
  fromSI(v: number): number;
}

export const SECONDS_PER_DAY = 86400;
/** Julian year, 365.25 d: the year used for all rates and time constants. */
export const JULIAN_YEAR_S = 365.25 * SECONDS_PER_DAY;

/** SI unit of each quantity, for help texts and reports. */
export const SI_SYMBOL: Readonly<Record<Quantity, string>> = {
  temperature: 'K',
  temperatureDifference: 'K',
  massFlow: 'kg/s',
  volumeFlow: 'm3/s',
  pressure: 'Pa',
  length: 'm',
  area: 'm2',
  energy: 'J',
  power: 'W',
  time: 's',
};

/** Search order when no quantity is given: absolute temperature wins over a difference. */
const QUANTITIES: readonly Quantity[] = [
  'temperature', 'temperatureDifference', 'massFlow', 'volumeFlow', 'pressure', 'length', 'area', 'energy', 'power', 'time',
];

const INCH_M = 0.0254;
const FOOT_M = 0.3048;
const POUND_KG = 0.45359237;
const POUND_FORCE_N = POUND_KG * 9.80665;
const BTU_IT_J = 1055.05585262;
const US_GALLON_M3 = 3.785411784e-3; // 231 in³; written out because 231·0.0254³ rounds one ulp low in binary
const BARREL_M3 = 42 * US_GALLON_M3;
const ACRE_M2 = 43560 * FOOT_M * FOOT_M; // international acre, 43 560 ft²
const ZERO_CELSIUS_K = 273.15;

/** [symbol, factor to SI, aliases] for units that are a plain multiple of the SI unit. */
type Linear = readonly [string, number, readonly string[]];

const LINEAR: Readonly<Record<Exclude<Quantity, 'temperature'>, readonly Linear[]>> = {
  temperatureDifference: [
    ['K', 1, ['kelvin', 'kelvins']],
    ['degC', 1, ['°C', 'C', 'deg C', 'celsius']],
    ['degF', 5 / 9, ['°F', 'F', 'deg F', 'fahrenheit']],
  ],
  massFlow: [
    ['kg/s', 1, ['kg/sec']],
    ['t/h', 1000 / 3600, ['t/hr', 'tph', 'tonne/h']],
    ['kg/h', 1 / 3600, ['kg/hr']],
    // 1 lb = 0.453 592 37 kg exactly (NIST SP 811, B.8).
    ['lb/s', POUND_KG, ['lbm/s']],
    ['lb/h', POUND_KG / 3600, ['lbm/h', 'lb/hr']],
    ['klb/h', 1000 * POUND_KG / 3600, ['klb/hr', 'kpph']],
  ],
  volumeFlow: [
    ['m3/s', 1, []],
    ['m3/h', 1 / 3600, ['m3/hr']],
    ['m3/d', 1 / SECONDS_PER_DAY, ['m3/day']],
    ['L/s', 1e-3, ['l/sec']],
    ['gpm', US_GALLON_M3 / 60, ['US gal/min', 'gal/min', 'usgpm']],
    ['bbl/d', BARREL_M3 / SECONDS_PER_DAY, ['bbl/day', 'bpd']],
  ],
  pressure: [
    ['Pa', 1, ['pascal']],
    ['kPa', 1e3, []],
    ['MPa', 1e6, []],
    // Absolute pressures only: 'bara'/'psia' are accepted, gauge readings ('barg', 'psig') are not.
    ['bar', 1e5, ['bara']],
    ['psi', POUND_FORCE_N / (INCH_M * INCH_M), ['psia', 'lbf/in2']],
    ['atm', 101325, []],
  ],
  length: [
    ['m', 1, ['metre', 'meter']],
    ['cm', 1e-2, []],
    ['km', 1e3, []],
    ['ft', FOOT_M, ['foot', 'feet']],
  ],
  area: [
    ['m2', 1, ['sq m']],
    ['km2', 1e6, ['sq km']],
    ['ha', 1e4, ['hectare', 'hectares']],
    ['ft2', FOOT_M * FOOT_M, ['sq ft']],
    ['acre', ACRE_M2, ['acres', 'ac']],
  ],
  energy: [
    ['J', 1, ['joule']],
    ['kJ', 1e3, []],
    ['MJ', 1e6, []],
    ['GJ', 1e9, []],
    ['TJ', 1e12, []],
    ['PJ', 1e15, []],
    ['Wh', 3600, []],
    ['kWh', 3.6e6, []],
    ['MWh', 3.6e9, []],
    ['GWh', 3.6e12, []],
    // International Table Btu: 1.055 055 852 62 × 10³ J (NIST SP 811, B.8).
    ['Btu', BTU_IT_J, ['BTU']],
    ['MMBtu', 1e6 * BTU_IT_J, ['MMBTU']],
  ],
  power: [
    ['W', 1, ['watt']],
    ['kW', 1e3, ['kWth']],
    ['MW', 1e6, ['MWth']],
    ['GW', 1e9, []],
    ['MMBtu/h', 1e6 * BTU_IT_J / 3600, ['MMBTU/h', 'MMBtu/hr']],
  ],
  time: [
    ['s', 1, ['sec']],
    ['min', 60, []],
    ['h', 3600, ['hr', 'hour', 'hours']],
    ['d', SECONDS_PER_DAY, ['day', 'days']],
    ['yr', JULIAN_YEAR_S, ['a', 'year', 'years']],
  ],
};

/**
 * Names whose case carries meaning and so are matched exactly: kelvin against the kilo prefix,
 * milli against mega (mPa, mW, mJ), pico against peta, metre against 'M', annum against ampere.
 * Every other name also matches case-insensitively.
 */
const EXACT_CASE = new Set(['K', 'm', 'MPa', 'MJ', 'MW', 'MWth', 'MWh', 'PJ', 'a']);

function linearUnit(quantity: Quantity, [symbol, factor, aliases]: Linear): UnitDef {
  return { symbol, quantity, aliases, toSI: (v) => v * factor, fromSI: (v) => v / factor };
}

// Absolute temperatures go through °C: T(°C) = T(K) − 273.15 (NIST SP 811 §4.2.1.1),
// T(°C) = (T(°F) − 32)·5/9 (NIST SP 811 B.8).
const TEMPERATURE: readonly UnitDef[] = [
  { symbol: 'K', quantity: 'temperature', aliases: ['kelvin', 'kelvins'], toSI: (v) => v, fromSI: (v) => v },
  {
    symbol: 'degC', quantity: 'temperature', aliases: ['°C', 'C', 'deg C', 'celsius'],
    toSI: (v) => v + ZERO_CELSIUS_K, fromSI: (v) => v - ZERO_CELSIUS_K,
  },
  {
    symbol: 'degF', quantity: 'temperature', aliases: ['°F', 'F', 'deg F', 'fahrenheit'],
    toSI: (v) => ((v - 32) * 5) / 9 + ZERO_CELSIUS_K, fromSI: (v) => ((v - ZERO_CELSIUS_K) * 9) / 5 + 32,
  },
];

interface Table {
  units: readonly UnitDef[];
  exact: Map<string, UnitDef>;
  folded: Map<string, UnitDef>;
  /** Lower-cased exact-case names, to suggest the right case in an error. */
  caseHints: Map<string, string>;
}

const TABLES = new Map<Quantity, Table>();
for (const quantity of QUANTITIES) {
  const units = quantity === 'temperature' ? TEMPERATURE : LINEAR[quantity].map((u) => linearUnit(quantity, u));
  const table: Table = { units, exact: new Map(), folded: new Map(), caseHints: new Map() };
  for (const unit of units) {
    for (const name of [unit.symbol, ...unit.aliases]) {
      const key = normalize(name);
      addOnce(table.exact, key, unit, quantity);
      if (EXACT_CASE.has(name)) table.caseHints.set(key.toLowerCase(), name);
      else addOnce(table.folded, key.toLowerCase(), unit, quantity);
    }
  }
  TABLES.set(quantity, table);
}

function addOnce(map: Map<string, UnitDef>, key: string, unit: UnitDef, quantity: Quantity): void {
  const other = map.get(key);
  // A programming error in the table above, not bad input.
  if (other !== undefined && other !== unit) throw new Error(`units: "${key}" names both ${other.symbol} and ${unit.symbol} (${quantity})`);
  map.set(key, unit);
}

/** Spelling variants people type: superscripts, ℃/℉, the ordinal º for °, 'm^3', spaces around '/'. */
function normalize(name: string): string {
  return name
    .trim()
    .replace(/\s+/g, ' ')
    .replace(/\s*\/\s*/g, '/')
    .replace(/℃/g, '°C')
    .replace(/℉/g, '°F')
    .replace(/º/g, '°')
    .replace(/²/g, '2')
    .replace(/³/g, '3')
    .replace(/\^/g, '');
}

function table(quantity: Quantity): Table {
  return TABLES.get(quantity) as Table;
}

function knownList(quantities: readonly Quantity[]): string {
  if (quantities.length === 1) return unitsOf(quantities[0]).join(', ');
  return quantities.map((q) => `${unitsOf(q).join(', ')} (${q})`).join('; ');
}

function lookup(key: string, quantities: readonly Quantity[]): UnitDef | undefined {
  for (const q of quantities) {
    const unit = table(q).exact.get(key);
    if (unit !== undefined) return unit;
  }
  for (const q of quantities) {
    const unit = table(q).folded.get(key.toLowerCase());
    if (unit !== undefined) return unit;
  }
  return undefined;
}

/**
 * The unit named `name`, searched in `quantity` (or in each listed quantity in turn, or in all).
 * Without a quantity, K/degC/degF mean absolute temperature; pass 'temperatureDifference' for differences.
 * Throws an InputError naming `field` when the unit is unknown or of another quantity.
 */
export function findUnit(name: string, quantity?: Quantity | readonly Quantity[], field?: string): UnitDef {
  const wanted: readonly Quantity[] =
    quantity === undefined ? QUANTITIES : typeof quantity === 'string' ? [quantity] : quantity.length > 0 ? quantity : QUANTITIES;
  const where = field === undefined ? {} : { field };
  const forWhat = wanted === QUANTITIES ? '' : ` for ${wanted.join(' or ')}`;
  const known = `known: ${knownList(wanted)}`;

  if (typeof name !== 'string' || name.trim() === '') throw new InputError(`missing unit${forWhat}; ${known}`, where);
  const key = normalize(name);
  const unit = lookup(key, wanted);
  if (unit !== undefined) return unit;

  const elsewhere = lookup(key, QUANTITIES.filter((q) => !wanted.includes(q)));
  if (elsewhere !== undefined) {
    throw new InputError(`"${name}" is a ${elsewhere.quantity} unit, not a ${wanted.join(' or ')} unit; ${known}`, where);
  }
  const hint = wanted.map((q) => table(q).caseHints.get(key.toLowerCase())).find((h) => h !== undefined);
  const caseNote = hint === undefined ? '' : ` (case matters for this unit: did you mean "${hint}"?)`;
  throw new InputError(`unknown unit "${name}"${forWhat}${caseNote}; ${known}`, where);
}

/**
 * `value` in `unit` converted to SI. Arithmetic only (NaN stays NaN), except that an absolute
 * temperature below absolute zero is an InputError: usually a difference logged as a temperature.
 */
export function toSI(value: number, unit: string, quantity?: Quantity, field?: string): number {
  const def = findUnit(unit, quantity, field);
  const si = def.toSI(value);
  // The tolerance absorbs rounding at exactly −273.15 °C or −459.67 °F.
  if (def.quantity === 'temperature' && si < -1e-9) {
    throw new InputError(`${value} ${unit} is below absolute zero (a temperature difference?)`, field === undefined ? {} : { field });
  }
  return si;
}

/** `valueSI` (in the SI unit of the quantity) converted to `unit`. */
export function fromSI(valueSI: number, unit: string, quantity?: Quantity, field?: string): number {
  return findUnit(unit, quantity, field).fromSI(valueSI);
}

/** Canonical unit names of a quantity, SI first, for help texts and pickers. */
export function unitsOf(quantity: Quantity): string[] {
  return table(quantity).units.map((u) => u.symbol);
}

const FLOW: readonly Quantity[] = ['massFlow', 'volumeFlow'];

/** Whether a logged flow unit measures mass or volume (volume needs a density to become kg/s). */
export function flowKind(unit: string, field?: string): 'mass' | 'volume' {
  return findUnit(unit, FLOW, field).quantity === 'massFlow' ? 'mass' : 'volume';
}

/**
 * A logged flow in kg/s. Volume flows are multiplied by `densityKgPerM3`, which the caller
 * takes from the water properties at the logged temperature (and records as an assumption).
 */
export function flowToMassFlowKgPerS(value: number, unit: string, densityKgPerM3?: number, field?: string): number {
  const def = findUnit(unit, FLOW, field);
  if (def.quantity === 'massFlow') return def.toSI(value);
  if (densityKgPerM3 === undefined) {
    throw new InputError(`volume flow in "${unit}" needs a water density to become a mass flow`, { field: 'densityKgPerM3' });
  }
  return def.toSI(value) * requirePositive(densityKgPerM3, 'densityKgPerM3');
}
