/** `tauwell add-well`: a production or injection well of a field. */
import type { CommandSpec, ParsedArgs } from '../args.js';
import { DB_OPTION, TIME_NOTE, WHO_OPTION, instantOption, withServices } from '../db-access.js';
import type { CliIo } from '../io.js';
import { toJsonText } from '../json.js';

export const ADD_WELL_COMMAND: CommandSpec = {
  name: 'add-well',
  summary: 'Add a well to a field of the log, with its reference temperature Tref (°C) for θ = T − Tref and the date production started.',
  usage: 'tauwell add-well --db FILE --field NAME --name NAME --kind production|injection [--reference-temperature C] [--production-start ISO] [--reservoir NAME] [--json]',
  options: [
    DB_OPTION,
    { name: 'field', kind: 'value', placeholder: 'NAME', required: true, help: 'the field the well belongs to' },
    { name: 'name', kind: 'value', placeholder: 'NAME', required: true, help: 'well name, unique in the field' },
    { name: 'kind', kind: 'value', placeholder: 'KIND', required: true, choices: ['production', 'injection'], help: 'production or injection well' },
    { name: 'reference-temperature', kind: 'value', placeholder: 'C', help: 'reference temperature Tref in °C (minimum useful or reinjection temperature); needed for fits' },
    { name: 'production-start', kind: 'value', placeholder: 'ISO', help: 'instant production started: time zero of fits (default: the first reading)' },
    { name: 'reservoir', kind: 'value', placeholder: 'NAME', help: 'reservoir of the same field the well produces from' },
    WHO_OPTION,
    { name: 'json', kind: 'flag', help: 'print the new well as JSON' },
  ],
  notes: [TIME_NOTE],
};

export function runAddWell(args: ParsedArgs, io: CliIo): number {
  const well = withServices(args, io, (services) => {
    const field = args.requireString('field');
    const zone = services.listWells({ field }).fields[0].timeZone;
    const start = instantOption(args, 'production-start', zone);
    const tref = args.number('reference-temperature');
    const reservoir = args.string('reservoir');
    return services.createWell({
      field, name: args.requireString('name'), kind: args.requireString('kind') as 'production' | 'injection',
      ...(tref !== undefined ? { referenceTemperatureC: tref } : {}),
      ...(start !== undefined ? { productionStart: start.iso } : {}),
      ...(reservoir !== undefined ? { reservoir } : {}),
    });
  });
  io.stdout.write(args.flag('json') ? toJsonText(well) : `added the ${well.kind} well ${well.name} to ${JSON.stringify(well.field)}\n`);
  return 0;
}
