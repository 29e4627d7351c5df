/**
 * The specific heat cw that turns θ into power and heat in a forecast, and where it came from —
 * the assumption a report must state (DOMAIN.md §4–5).
 */
import { InputError } from '../../shared/errors.js';
import { liquidWater, saturationPressurePa } from '../../shared/water/iapws97.js';
import { celsius, num } from './display.js';

export interface SpecificHeat {
  valueJPerKgK: number;
  source: 'given' | 'IAPWS-IF97 region 1' | 'assumed';
  /** Plain words for the report. */
  note: string;
  /** State of the IAPWS evaluation. */
  temperatureK?: number;
  pressurePa?: number;
}

/** Room-temperature water, 4186 J/(kg·K) (common practice); 5–10 % off at 150–200 °C (DOMAIN.md §5). */
export const ASSUMED_SPECIFIC_HEAT_J_PER_KG_K = 4186;

/**
 * Liquid is kept above its boiling point in the production line; 1 MPa over saturation is a
 * representative wellhead margin (an assumption stated in the output). cp of compressed liquid
 * changes by well under 1 % per MPa below 200 °C, so the exact margin hardly matters.
 */
const PRESSURE_MARGIN_PA = 1e6;

export function specificHeatFor(givenJPerKgK: number | undefined, meanProductionTemperatureK: number | null): SpecificHeat {
  if (givenJPerKgK !== undefined) return { valueJPerKgK: givenJPerKgK, source: 'given', note: 'given with --specific-heat' };
  if (meanProductionTemperatureK === null) {
    return {
      valueJPerKgK: ASSUMED_SPECIFIC_HEAT_J_PER_KG_K,
      source: 'assumed',
      note: `ASSUMED ${ASSUMED_SPECIFIC_HEAT_J_PER_KG_K} J/(kg K), water near room temperature (common practice); give --reference to use IAPWS-IF97 at the production temperature, or --specific-heat`,
    };
  }
  const t = meanProductionTemperatureK;
  try {
    const p = saturationPressurePa(t) + PRESSURE_MARGIN_PA;
    const cp = liquidWater(t, p).specificHeatJPerKgK;
    return {
      valueJPerKgK: cp,
      source: 'IAPWS-IF97 region 1',
      note: `IAPWS-IF97 cp at the mean production temperature ${celsius(t)} and ${num(p / 1e6, 4)} MPa (saturation + 1 MPa)`,
      temperatureK: t,
      pressurePa: p,
    };
  } catch (e) {
    if (e instanceof InputError) {
      throw new InputError(`cannot take cp from IAPWS-IF97 at the mean production temperature ${celsius(t)} (${e.reason}); give --specific-heat`, { field: '--specific-heat' });
    }
    throw e;
  }
}
