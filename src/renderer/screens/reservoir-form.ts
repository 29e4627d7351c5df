/**
 * The reservoir form as data: which inputs each heat model has, their labels and units in the
 * user's display system, and the two-way mapping between the text in the inputs and the stored
 * parameters (the keys of `tauwell theory --params`: °C, MPa, SI otherwise; params.ts).
 *
 * An InputError from the form, from parseReservoirParams or from the back end names a key of the
 * parameters (`gradient`, `fluid.iapws.pressure`, `params.area` from addReservoirVersion);
 * `controlOf` says which input shows it. DOM-free, so it can be tested without a browser.
 */
import type { Display, ShownQuantity } from '../app/display.js';
import { InputError } from '../../shared/errors.js';
import type { DisplayUnits } from '../../shared/contract/settings.js';
import { parseReservoirParams } from '../../shared/reservoir/params.js';
import { reservoirTheory, type ReservoirParams, type ReservoirTheory } from '../../shared/reservoir/theory.js';
import { areaUnit, gradientUnit, lengthUnit, significant, type LinearUnit } from './reservoir-units.js';

export type ModelKind = 'hot-dry-rock' | 'aquifer';
export type FlowKind = 'mass' | 'volume';
export type FluidKind = 'iapws' | 'fixed';

/** The numeric inputs, named by their key in the parameters ('flow' is massFlow or volumeFlow). */
export type NumericKey =
  | 'surfaceTemperature' | 'gradient' | 'minUsefulTemperature' | 'maxDepth' | 'depth' | 'thickness' | 'porosity'
  | 'area' | 'rockDensity' | 'rockSpecificHeat' | 'flow'
  | 'fluid.density' | 'fluid.specificHeat' | 'fluid.iapws.temperature' | 'fluid.iapws.pressure';

/** Every control of the form: the numeric inputs, the three choices and the parameters' own note. */
export type ControlKey = NumericKey | 'kind' | 'flowKind' | 'fluidKind' | 'note';

/** The Display methods the form needs (a plain Display, or a stand-in in tests). */
export type FormDisplay = Pick<Display, 'units' | 'unit' | 'unitSymbol' | 'toSI' | 'value'>;

export interface FormState {
  kind: ModelKind;
  flowKind: FlowKind;
  fluidKind: FluidKind;
  /** What is in each numeric input, in the display unit. */
  text: Partial<Record<NumericKey, string>>;
  /** Free text stored with the parameters (where the values came from). */
  note: string;
  /**
   * The stored values the form was filled from and the text they were shown as: an input left
   * untouched gives back its stored value exactly, not the rounded display of a converted one.
   */
  loaded: Partial<Record<NumericKey, { text: string; stored: number }>>;
}

export interface NumericControl {
  key: NumericKey;
  /** Label without its unit, e.g. 'Surface temperature T0'. */
  label: string;
  /** Typical values, common practice, as a hint under the input. */
  hint?: string;
}

/** Groups of inputs as the form shows them, in order. */
export interface ControlGroup {
  title: string;
  controls: NumericControl[];
}

export function controlGroups(state: Pick<FormState, 'kind' | 'fluidKind'>, units: DisplayUnits = 'si'): ControlGroup[] {
  // 25–30 K/km, the continental mean (common practice), in the unit the gradient is entered in.
  const g = gradientUnit(units);
  const typicalGradient = units === 'si'
    ? 'continental mean ≈ 25–30 K/km (common practice)'
    : `continental mean ≈ ${(0.025 / g.factor).toFixed(2)}–${(0.03 / g.factor).toFixed(2)} ${g.label} (25–30 K/km, common practice)`;
  const geometry: NumericControl[] = state.kind === 'hot-dry-rock'
    ? [{ key: 'maxDepth', label: 'Well depth z2', hint: 'deepest useful depth the wells reach' }]
    : [
        { key: 'depth', label: 'Aquifer depth z2' },
        { key: 'thickness', label: 'Aquifer thickness h' },
        { key: 'porosity', label: 'Porosity φ', hint: 'fraction of the rock that is pore space, 0 to below 1' },
      ];
  const fluid: NumericControl[] = state.fluidKind === 'iapws'
    ? [
        { key: 'fluid.iapws.temperature', label: 'Water temperature', hint: 'properties from IAPWS-IF97 at this state' },
        { key: 'fluid.iapws.pressure', label: 'Water pressure' },
      ]
    : [
        { key: 'fluid.density', label: 'Water density ρw', hint: '1000 kg/m³ near room temperature (common practice)' },
        { key: 'fluid.specificHeat', label: 'Water specific heat cw', hint: '4186 J/(kg·K) near room temperature (common practice)' },
      ];
  return [
    {
      title: 'Geotherm',
      controls: [
        { key: 'surfaceTemperature', label: 'Surface temperature T0' },
        { key: 'gradient', label: 'Geothermal gradient G', hint: typicalGradient },
        { key: 'minUsefulTemperature', label: 'Minimum useful temperature T1', hint: 'often the reinjection temperature' },
      ],
    },
    { title: state.kind === 'hot-dry-rock' ? 'Swept slab' : 'Aquifer', controls: [...geometry, { key: 'area', label: 'Plan area A' }] },
    {
      title: 'Rock',
      controls: [
        { key: 'rockDensity', label: 'Rock density ρr', hint: 'granite ≈ 2700 kg/m³ (common practice)' },
        { key: 'rockSpecificHeat', label: 'Rock specific heat cr', hint: 'granite ≈ 800–850 J/(kg·K) (common practice)' },
      ],
    },
    { title: 'Circulation', controls: [{ key: 'flow', label: 'Circulated flow' }] },
    { title: 'Water properties', controls: fluid },
  ];
}

/** How one input's text becomes the stored number and back. */
interface Conversion {
  unit: string;
  toStored(shown: number): number;
  fromStored(stored: number): number;
  /** True when shown and stored are the same number (no rounding on display). */
  identity: boolean;
}

const linear = (u: LinearUnit, storedPerSI = 1): Conversion => ({
  unit: u.label,
  toStored: (v) => v * u.factor * storedPerSI,
  fromStored: (v) => v / storedPerSI / u.factor,
  identity: u.factor * storedPerSI === 1,
});

/** Stored temperatures are °C (params.ts); shown in the display's temperature unit. */
function temperature(display: FormDisplay): Conversion {
  return {
    unit: display.unit('temperature'),
    toStored: (v) => display.toSI('temperature', v) - 273.15,
    fromStored: (v) => display.value('temperature', v + 273.15),
    identity: display.unitSymbol('temperature') === 'degC',
  };
}

/** A Display quantity whose stored unit is SI times `siPerStored` (e.g. MPa: 1e6 Pa). */
function shown(display: FormDisplay, q: ShownQuantity, siPerStored = 1): Conversion {
  return {
    unit: display.unit(q),
    toStored: (v) => display.toSI(q, v) / siPerStored,
    fromStored: (v) => display.value(q, v * siPerStored),
    identity: display.toSI(q, 1) === siPerStored,
  };
}

const FIXED = (unit: string): Conversion => ({ unit, toStored: (v) => v, fromStored: (v) => v, identity: true });

/**
 * Rock and water properties stay in SI in both systems: they are quoted in SI in the literature
 * the values come from, and converting them would only add rounding.
 */
function conversion(key: NumericKey, flowKind: FlowKind, display: FormDisplay): Conversion {
  const units: DisplayUnits = display.units;
  switch (key) {
    case 'surfaceTemperature':
    case 'minUsefulTemperature':
    case 'fluid.iapws.temperature':
      return temperature(display);
    case 'gradient':
      return linear(gradientUnit(units));
    case 'maxDepth':
    case 'depth':
    case 'thickness':
      return linear(lengthUnit(units));
    case 'area':
      return linear(areaUnit(units));
    case 'porosity':
      return FIXED('fraction');
    case 'rockDensity':
    case 'fluid.density':
      return FIXED('kg/m³');
    case 'rockSpecificHeat':
    case 'fluid.specificHeat':
      return FIXED('J/(kg·K)');
    case 'flow':
      return flowKind === 'mass' ? shown(display, 'massFlow') : shown(display, 'volumeFlow');
    case 'fluid.iapws.pressure':
      return shown(display, 'pressure', 1e6);
  }
}

/** The unit label of an input, e.g. '°F' or 'K/km'. */
export function unitOf(key: NumericKey, state: Pick<FormState, 'flowKind'>, display: FormDisplay): string {
  return conversion(key, state.flowKind, display).unit;
}

/** The label with its unit, as the input's accessible name: 'Surface temperature T0 (°C)'. */
export function labelWithUnit(control: NumericControl, state: Pick<FormState, 'flowKind'>, display: FormDisplay): string {
  const label = control.key === 'flow' ? (state.flowKind === 'mass' ? 'Mass flow ṁ' : 'Volume flow V̇') : control.label;
  return `${label} (${unitOf(control.key, state, display)})`;
}

/** The stored parameter key of an input. */
export function storedKey(key: NumericKey, flowKind: FlowKind): string {
  return key === 'flow' ? (flowKind === 'mass' ? 'massFlow' : 'volumeFlow') : key;
}

/** The input that shows an error about `field` (a parameter key, maybe prefixed 'params.'); null: the form as a whole. */
export function controlOf(field: string | undefined): ControlKey | null {
  if (field === undefined) return null;
  const key = field.replace(/^params\.?/, '');
  switch (key) {
    case '':
      return null;
    case 'massFlow':
    case 'volumeFlow':
      return 'flow';
    case 'fluid':
      return 'fluidKind';
    case 'fluid.iapws':
      return 'fluid.iapws.temperature';
    case 'kind':
    case 'note':
    case 'surfaceTemperature': case 'gradient': case 'minUsefulTemperature': case 'maxDepth': case 'depth':
    case 'thickness': case 'porosity': case 'area': case 'rockDensity': case 'rockSpecificHeat':
    case 'fluid.density': case 'fluid.specificHeat': case 'fluid.iapws.temperature': case 'fluid.iapws.pressure':
      return key;
    default:
      return null;
  }
}

/** A blank form for a new reservoir: a slab, mass flow, water properties from IAPWS-IF97. */
export function emptyForm(): FormState {
  return { kind: 'hot-dry-rock', flowKind: 'mass', fluidKind: 'iapws', text: {}, note: '', loaded: {} };
}

/** Shown text of a stored value: exact where no conversion happens, else 6 significant digits. */
function textOf(stored: number, c: Conversion): string {
  return c.identity ? String(stored) : String(Number(c.fromStored(stored).toPrecision(6)));
}

/** Fills the form from stored parameters (as listReservoirVersions returns them). Unknown shapes leave inputs blank. */
export function formFromParams(params: unknown, display: FormDisplay): FormState {
  const p = isObject(params) ? params : {};
  const fluid = isObject(p.fluid) ? p.fluid : {};
  const iapws = isObject(fluid.iapws) ? fluid.iapws : undefined;
  const state: FormState = {
    kind: p.kind === 'aquifer' ? 'aquifer' : 'hot-dry-rock',
    flowKind: p.volumeFlow !== undefined && p.massFlow === undefined ? 'volume' : 'mass',
    fluidKind: iapws !== undefined || fluid.density === undefined ? 'iapws' : 'fixed',
    text: {},
    note: typeof p.note === 'string' ? p.note : '',
    loaded: {},
  };
  const values: Record<NumericKey, unknown> = {
    surfaceTemperature: p.surfaceTemperature, gradient: p.gradient, minUsefulTemperature: p.minUsefulTemperature,
    maxDepth: p.maxDepth, depth: p.depth, thickness: p.thickness, porosity: p.porosity, area: p.area,
    rockDensity: p.rockDensity, rockSpecificHeat: p.rockSpecificHeat,
    flow: state.flowKind === 'mass' ? p.massFlow : p.volumeFlow,
    'fluid.density': fluid.density, 'fluid.specificHeat': fluid.specificHeat,
    'fluid.iapws.temperature': iapws?.temperature, 'fluid.iapws.pressure': iapws?.pressure,
  };
  for (const [key, value] of Object.entries(values) as [NumericKey, unknown][]) {
    if (typeof value !== 'number' || !Number.isFinite(value)) continue;
    const text = textOf(value, conversion(key, state.flowKind, display));
    state.text[key] = text;
    state.loaded[key] = { text, stored: value };
  }
  return state;
}

/** '−12.5', '1e3', '+4' — a plain decimal number; thousands separators and decimal commas are refused. */
const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;

function readNumber(state: FormState, key: NumericKey, display: FormDisplay): number {
  const raw = (state.text[key] ?? '').trim().replace(/^−/, '-');
  const field = storedKey(key, state.flowKind);
  if (raw === '') throw new InputError('missing: enter a value', { field });
  if (!NUMBER.test(raw)) throw new InputError(`must be a number such as 12.5 (got "${state.text[key]}")`, { field });
  const loaded = state.loaded[key];
  if (loaded !== undefined && loaded.text === state.text[key]) return loaded.stored;
  const c = conversion(key, state.flowKind, display);
  // Where nothing is converted, the number typed is the number stored (no 273.15 round trip).
  return c.identity ? Number(raw) : c.toStored(Number(raw));
}

/**
 * The stored parameters of the form, in the keys of `tauwell theory --params`. Throws an InputError
 * naming the key of an input that is blank or not a number; everything else is parseReservoirParams's job.
 */
export function paramsOfForm(state: FormState, display: FormDisplay): Record<string, unknown> {
  const num = (key: NumericKey): number => readNumber(state, key, display);
  const out: Record<string, unknown> = {};
  if (state.note.trim() !== '') out.note = state.note.trim();
  out.kind = state.kind;
  out.surfaceTemperature = num('surfaceTemperature');
  out.gradient = num('gradient');
  out.minUsefulTemperature = num('minUsefulTemperature');
  if (state.kind === 'hot-dry-rock') out.maxDepth = num('maxDepth');
  else {
    out.depth = num('depth');
    out.thickness = num('thickness');
    out.porosity = num('porosity');
  }
  out.area = num('area');
  out.rockDensity = num('rockDensity');
  out.rockSpecificHeat = num('rockSpecificHeat');
  out[storedKey('flow', state.flowKind)] = num('flow');
  out.fluid = state.fluidKind === 'iapws'
    ? { iapws: { temperature: num('fluid.iapws.temperature'), pressure: num('fluid.iapws.pressure') } }
    : { density: num('fluid.density'), specificHeat: num('fluid.specificHeat') };
  return out;
}

export type Evaluation =
  | { ok: true; json: Record<string, unknown>; params: ReservoirParams; theory: ReservoirTheory }
  | { ok: false; error: InputError; control: ControlKey | null };

/** The form checked and computed: the theory, or the first error and the input it belongs to. */
export function evaluateForm(state: FormState, display: FormDisplay): Evaluation {
  try {
    const json = paramsOfForm(state, display);
    const params = parseReservoirParams(json);
    return { ok: true, json, params, theory: reservoirTheory(params) };
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    return { ok: false, error: e, control: controlOf(e.where.field) };
  }
}

/** The theory of stored parameters, or the reason they do not give one. */
export function theoryOfStored(params: unknown): { theory: ReservoirTheory } | { error: string } {
  try {
    return { theory: reservoirTheory(parseReservoirParams(params)) };
  } catch (e) {
    if (e instanceof InputError) return { error: e.message };
    throw e;
  }
}

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

const KEY_LABELS: Record<string, string> = {
  surfaceTemperature: 'Surface temperature T0', gradient: 'Geothermal gradient G', minUsefulTemperature: 'Minimum useful temperature T1',
  maxDepth: 'Well depth z2', depth: 'Aquifer depth z2', thickness: 'Aquifer thickness h', porosity: 'Porosity φ', area: 'Plan area A',
  rockDensity: 'Rock density ρr', rockSpecificHeat: 'Rock specific heat cr', massFlow: 'Mass flow ṁ', volumeFlow: 'Volume flow V̇',
  'fluid.density': 'Water density ρw', 'fluid.specificHeat': 'Water specific heat cw',
  'fluid.iapws.temperature': 'Water temperature', 'fluid.iapws.pressure': 'Water pressure',
};

/** The label of a stored parameter key, e.g. 'rockDensity' → 'Rock density ρr'. */
export function labelOfKey(key: string): string {
  return KEY_LABELS[key] ?? key;
}

/** The input of a stored parameter key ('massFlow' → 'flow'). */
export function numericKeyOf(key: string): NumericKey | null {
  const c = controlOf(key);
  return c === null || c === 'kind' || c === 'flowKind' || c === 'fluidKind' || c === 'note' ? null : c;
}

/** A stored value shown in the input's display unit, e.g. 12 (°C) → '53.6 °F'. */
export function shownStored(key: string, stored: number, display: FormDisplay): string {
  const numeric = numericKeyOf(key);
  if (numeric === null) return String(stored);
  const c = conversion(numeric, key === 'volumeFlow' ? 'volume' : 'mass', display);
  return `${significant(c.fromStored(stored), 4)} ${c.unit}`;
}

/**
 * Switches between mass and volume flow. The flow typed so far is carried over through the water
 * density of the last good evaluation (V̇ = ṁ/ρw); without one the input is cleared.
 */
export function withFlowKind(state: FormState, to: FlowKind, lastTheory: ReservoirTheory | null, display: FormDisplay): FormState {
  if (state.flowKind === to) return state;
  const next: FormState = { ...state, flowKind: to, text: { ...state.text }, loaded: { ...state.loaded } };
  delete next.loaded.flow;
  delete next.text.flow;
  if (lastTheory !== null) {
    const rho = lastTheory.fluid.densityKgPerM3;
    const stored = to === 'volume' ? lastTheory.massFlowKgPerS / rho : lastTheory.massFlowKgPerS;
    next.text.flow = String(Number(conversion('flow', to, display).fromStored(stored).toPrecision(4)));
  }
  return next;
}

/**
 * Switches the source of the water properties. Going to fixed values, empty inputs are filled with
 * the properties the last good evaluation used, so the result does not jump.
 */
export function withFluidKind(state: FormState, to: FluidKind, lastTheory: ReservoirTheory | null): FormState {
  if (state.fluidKind === to) return state;
  const next: FormState = { ...state, fluidKind: to, text: { ...state.text } };
  if (to === 'fixed' && lastTheory !== null) {
    next.text['fluid.density'] ??= String(Number(lastTheory.fluid.densityKgPerM3.toPrecision(5)));
    next.text['fluid.specificHeat'] ??= String(Number(lastTheory.fluid.specificHeatJPerKgK.toPrecision(5)));
  }
  return next;
}
