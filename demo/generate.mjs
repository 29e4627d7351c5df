// Generates the INVENTED demo field used by `npm run demo` and the README walk-through.
// "Kettle Ridge" is not a real field: three production wells of an imagined hot-dry-rock system, weekly
// wellhead readings over twelve years from a seeded lumped model with some recharge, one well that
// short-circuits (cools faster than its share of rock allows), flow changes, shut-ins and noise.
//   node demo/generate.mjs        (writes demo/invented-field.csv; deterministic)
import { writeFileSync } from 'node:fs';

const WEEK_S = 7 * 86400;
const YEAR_S = 365.25 * 86400;
const CW = 4300; // J/(kg K), roughly IAPWS-IF97 cp near 160 °C
const T_REF_C = 70; // reinjection temperature, the minimum useful temperature

function mulberry32(seed) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
const rand = mulberry32(20261201);
const normal = () => Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());

// Heat capacity of each well's swept rock, J/K, and the share of extracted heat replenished.
const wells = [
  { name: 'KR-1', thetaStartK: 106, heatCapacityJPerK: 2.3e14, rechargeFraction: 0.15, flows: [[0, 45], [5 * YEAR_S, 58]] },
  { name: 'KR-2', thetaStartK: 99, heatCapacityJPerK: 2.0e14, rechargeFraction: 0.05, flows: [[0, 50], [7.5 * YEAR_S, 40]] },
  { name: 'KR-3', thetaStartK: 111, heatCapacityJPerK: 0.9e14, rechargeFraction: 0.0, flows: [[0, 42]] },
];
const start = Date.UTC(2014, 0, 6, 9, 0, 0); // a Monday morning, readings taken weekly
const weeks = 12 * 52;

const rows = ['time,well,production_temp_C,flow_kg_s,injection_temp_C,status'];
for (const well of wells) {
  let theta = well.thetaStartK;
  let shutInLeft = 0;
  for (let k = 0; k < weeks; k++) {
    const t = k * WEEK_S;
    const flow = well.flows.filter(([from]) => t >= from).at(-1)[1];
    if (shutInLeft === 0 && rand() < 0.012) shutInLeft = 1 + Math.floor(rand() * 3);
    const producing = shutInLeft === 0;
    if (!producing) shutInLeft--;
    // C·dθ/dt = −ṁ·cw·θ·(1 − f) over one week while producing (DOMAIN.md §2 and §7).
    if (producing && k > 0) theta *= Math.exp((-flow * CW * (1 - well.rechargeFraction) * WEEK_S) / well.heatCapacityJPerK);
    const time = new Date(start + t * 1000).toISOString().replace('.000Z', 'Z');
    const measured = producing ? T_REF_C + theta + 0.35 * normal() : T_REF_C + theta - 8 - 4 * rand();
    const flowLogged = producing ? flow * (1 + 0.01 * normal()) : 0;
    const inj = T_REF_C + 0.5 * normal();
    rows.push([time, well.name, measured.toFixed(2), flowLogged.toFixed(1), inj.toFixed(1), producing ? 'producing' : 'shut-in'].join(','));
  }
}
writeFileSync(new URL('./invented-field.csv', import.meta.url), rows.join('\n') + '\n');
console.log(`wrote ${rows.length - 1} invented readings to demo/invented-field.csv`);
