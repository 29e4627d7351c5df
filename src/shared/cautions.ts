/**
 * The cautions every forecast, parameter screen and report shows. Wording is the project's own;
 * the substance is common practice in the trade.
 */
export const CAUTIONS: readonly string[] = Object.freeze([
  'Forecasts are estimates from a simplified lumped heat model and field readings; they do not replace an assessment by a licensed reservoir engineer.',
  'Drilling, stimulation, reinjection and plant operation are governed by local codes and permits; injecting fluid can induce seismicity.',
  'Wellhead fluids are hot and under pressure: take readings only under the site’s safety procedures.',
]);
