// The settings screen's pure logic (src/renderer/screens/settings-model.ts): units in words, time zone
// checks, the economic limit between display units and the contract, and the update request.
import { describe, expect, it } from 'vitest';
import type { Wire } from '../src/shared/contract/channels.js';
import type { SettingsJson } from '../src/shared/contract/settings.js';
import { InputError } from '../src/shared/errors.js';
import {
  buildSettingsUpdate, checkTimeZone, DEFAULT_HEAT_FLOW_MW_PER_M2, errorKey, heatFlowShown, isTimeZone, limitFromShown, limitShown,
  parseNumber, reexpress, unitSummary, type SettingsForm,
} from '../src/renderer/screens/settings-model.js';

const BTU_IT_J = 1055.05585262; // International Table Btu (NIST SP 811 B.8)

describe('units and zones', () => {
  it('says what each unit system shows (the Display table)', () => {
    expect(unitSummary('si')).toBe('°C, kg/s, m³/h, MPa, MWth, PJ');
    expect(unitSummary('us')).toBe('°F, klb/h, US gal/min, psia, MMBtu/h, MMBtu');
  });

  it('knows IANA zones, and refuses others naming the timeZone field', () => {
    expect(isTimeZone('Europe/Berlin')).toBe(true);
    expect(isTimeZone('UTC')).toBe(true);
    expect(isTimeZone('Asia/Calcutta')).toBe(true); // an IANA link to Asia/Kolkata (tz database 'backward' file)
    expect(isTimeZone('Mars/Olympus_Mons')).toBe(false);
    expect(isTimeZone('')).toBe(false);
    expect(checkTimeZone(' Pacific/Auckland ')).toBe('Pacific/Auckland');
    expect(() => checkTimeZone('Mars/Olympus_Mons')).toThrow(InputError);
  });

  it('reads decimal points and commas, nothing else', () => {
    expect(parseNumber('115,5', 'x')).toBe(115.5);
    expect(parseNumber(' 60 ', 'x')).toBe(60);
    expect(() => parseNumber('', 'x')).toThrow('enter a number');
    expect(() => parseNumber('12 °C', 'x')).toThrow(InputError);
  });
});

describe('the economic limit between the form and the contract', () => {
  it('a production temperature', () => {
    expect(limitFromShown('production-temperature', '115', 'si', 'f')).toEqual({ kind: 'production-temperature', temperatureC: 115 });
    // 239 °F = (239 − 32)·5/9 = 115 °C (NIST SP 811 B.8).
    expect(limitFromShown('production-temperature', '239', 'us', 'f')).toEqual({ kind: 'production-temperature', temperatureC: 115 });
    expect(limitShown({ kind: 'production-temperature', temperatureC: 115 }, 'us')).toBeCloseTo(239, 9);
    // −300 °C is below absolute zero, −273.15 °C (SI Brochure); the message names the form's field.
    let caught: unknown;
    try { limitFromShown('production-temperature', '-300', 'si', 'economicLimit'); } catch (e) { caught = e; }
    expect(caught).toBeInstanceOf(InputError);
    expect((caught as InputError).where.field).toBe('economicLimit');
    expect((caught as InputError).reason).toMatch(/below absolute zero/);
  });

  it('θ as a temperature difference, and a thermal power', () => {
    // An 18 °F difference is 18·5/9 = 10 K (NIST SP 811 B.8).
    expect(limitFromShown('theta', '18', 'us', 'f')).toEqual({ kind: 'theta', thetaK: 10 });
    expect(limitFromShown('power', '2.5', 'si', 'f')).toEqual({ kind: 'power', powerW: 2.5e6 });
    // 10 MMBtu/h = 10 · 1055.05585262e6 J / 3600 s = 2 930 710.7017 W.
    const p = limitFromShown('power', '10', 'us', 'f');
    expect(p.kind === 'power' ? p.powerW : NaN).toBeCloseTo(10 * BTU_IT_J * 1e6 / 3600, 3);
    expect(() => limitFromShown('theta', '0', 'si', 'f')).toThrow(/greater than zero/);
  });

  it('re-expresses a typed limit when the units change', () => {
    expect(reexpress('production-temperature', '115', 'si', 'us')).toBe('239');
    // 1 MW = 3600 / 1055.05585262 = 3.412141633 MMBtu/h (NIST SP 811 B.8), to 10 digits.
    expect(reexpress('power', '1', 'si', 'us')).toBe('3.412141633');
    expect(reexpress('theta', '', 'si', 'us')).toBe('');
    expect(reexpress('theta', 'abc', 'si', 'us')).toBe('abc');
  });

  it('the background heat flow in mW/m²', () => {
    // 60 mW/m²: mean continental heat flow (DOMAIN.md §7, common practice).
    expect(DEFAULT_HEAT_FLOW_MW_PER_M2).toBe(60);
    expect(heatFlowShown(0.065)).toBe(65);
  });
});

const DEFAULTS: Wire<SettingsJson> = {
  units: 'si', timeZone: null,
  economicLimit: { kind: 'production-temperature', temperatureC: 100 },
  wellEconomicLimits: { 3: { kind: 'theta', thetaK: 30 } },
  backgroundHeatFlowWPerM2: 0.06, horizonYears: 30,
  source: { units: 'default', timeZone: 'default', economicLimit: 'default', backgroundHeatFlowWPerM2: 'default', horizonYears: 'default' },
  updatedAt: null,
};

/** The form as the screen first shows DEFAULTS: built-in values left empty. */
const UNTOUCHED: SettingsForm = {
  units: 'si', timeZone: null, limitKind: 'production-temperature', limitValue: '',
  wellLimits: [{ wellId: 1, kind: null, value: '' }, { wellId: 3, kind: 'theta', value: '30' }],
  heatFlowMilliWPerM2: '', horizonYears: '', reason: '',
};

describe('the update request', () => {
  it('sends nothing for an untouched form, so the defaults stay marked as defaults', () => {
    expect(buildSettingsUpdate(UNTOUCHED, DEFAULTS)).toEqual({ request: {}, errors: {} });
  });

  it('sends only what changed, in the contract’s units', () => {
    const { request, errors } = buildSettingsUpdate({
      ...UNTOUCHED, units: 'us', timeZone: 'Europe/Berlin', limitValue: '230', heatFlowMilliWPerM2: '65', horizonYears: '40', reason: 'plant review',
      wellLimits: [{ wellId: 1, kind: 'power', value: '10' }, { wellId: 3, kind: null, value: '' }],
    }, DEFAULTS);
    expect(errors).toEqual({});
    // 230 °F = (230 − 32)·5/9 = 110 °C; 10 MMBtu/h = 2 930 710.7017 W (NIST SP 811 B.8).
    expect(request).toEqual({
      units: 'us', timeZone: 'Europe/Berlin',
      economicLimit: { kind: 'production-temperature', temperatureC: 110 },
      wellEconomicLimits: { 1: { kind: 'power', powerW: expect.closeTo(2930710.7017, 3) }, 3: null },
      backgroundHeatFlowWPerM2: 0.065, horizonYears: 40, reason: 'plant review',
    });
  });

  it('typing the built-in value sets it', () => {
    expect(buildSettingsUpdate({ ...UNTOUCHED, limitValue: '100' }, DEFAULTS).request).toEqual({ economicLimit: { kind: 'production-temperature', temperatureC: 100 } });
    const set: Wire<SettingsJson> = { ...DEFAULTS, source: { ...DEFAULTS.source, economicLimit: 'set' } };
    expect(buildSettingsUpdate({ ...UNTOUCHED, limitValue: '100' }, set).request).toEqual({});
  });

  it('keys each message by the field it belongs beside', () => {
    const { errors } = buildSettingsUpdate({
      ...UNTOUCHED, timeZone: 'Mars/Olympus_Mons', limitKind: 'theta', horizonYears: '0', heatFlowMilliWPerM2: 'lots',
      wellLimits: [{ wellId: 1, kind: 'theta', value: '-2' }],
    }, DEFAULTS);
    expect(Object.keys(errors).sort()).toEqual(['backgroundHeatFlowWPerM2', 'economicLimit', 'horizonYears', 'timeZone', 'wellEconomicLimits.1']);
    expect(errors.economicLimit).toBe('enter a value for this kind of limit');
    expect(errorKey('economicLimit.temperatureC')).toBe('economicLimit');
    expect(errorKey('wellEconomicLimits.3.thetaK')).toBe('wellEconomicLimits.3');
    expect(errorKey('horizonYears')).toBe('horizonYears');
    expect(errorKey(undefined)).toBe('form');
  });
});
