/**
 * `tauwell report --db FILE (--well NAME | --field NAME) --out FILE.pdf|FILE.html`: the offline decline
 * report of a well or of a whole field, as a PDF (printed by Chromium) or as one self-contained HTML
 * file that opens in any browser without a network.
 */
import { writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import type { ForecastLimit } from '../../../shared/contract/fits.js';
import { DISPLAY_UNITS, type DisplayUnits } from '../../../shared/contract/settings.js';
import { InputError } from '../../../shared/errors.js';
import { PAPERS, type Paper } from '../../report/assemble.js';
import { createReportService } from '../../services/report.js';
import type { CommandSpec, ParsedArgs } from '../args.js';
import { DB_OPTION, asOptions, withServices } from '../db-access.js';
import type { CliIo } from '../io.js';

export const REPORT_COMMAND: CommandSpec = {
  name: 'report',
  summary: 'Write the decline report of a well or a field for offline reading: PDF (A4 or US Letter) or one self-contained HTML file.',
  usage: 'tauwell report --db FILE (--well NAME | --field NAME) --out FILE.pdf|FILE.html [--limit-temp C] [--units si|us] [--paper a4|letter]',
  options: [
    DB_OPTION,
    { name: 'well', kind: 'value', placeholder: 'NAME', help: 'report on this well (with --field when several fields have a well of that name)' },
    { name: 'field', kind: 'value', placeholder: 'NAME', help: 'report on every well of this field: a ranking by years to the economic limit, the field\'s thermal output, then each well' },
    { name: 'out', kind: 'value', placeholder: 'FILE', required: true, help: 'the report to write: FILE.pdf (printed by Chromium) or FILE.html (opens offline in any browser)' },
    { name: 'limit-temp', kind: 'value', placeholder: 'C', help: 'economic limit of every well as a production temperature in °C (default: the settings\' limit, a well\'s own first)' },
    { name: 'units', kind: 'value', placeholder: 'UNITS', choices: DISPLAY_UNITS, defaultText: 'the settings\' units', help: 'display units: si (°C, kg/s, MW, PJ) or us (°F, klb/h, MMBtu/h, MMBtu)' },
    { name: 'paper', kind: 'value', placeholder: 'PAPER', choices: PAPERS, defaultText: 'a4', help: 'paper size of the PDF (and of the HTML file when printed)' },
  ],
  notes: [
    'Each well is forecast with the model, basis and window of its latest stored fit (the best model by AICc on the time basis for a well never fitted); the fit is stored, and the report names it with the fingerprint of the readings it used. Dates are in the settings\' time zone, else the field\'s.',
    'A PDF needs Chromium: TAUWELL_CHROMIUM names the program, else /usr/bin/chromium is used. TAUWELL_REPORT_PAGE names a built report page other than out/report/report.html (made by `npm run build:renderer`).',
  ],
};

export async function runReport(args: ParsedArgs, io: CliIo): Promise<number> {
  const out = args.requireString('out');
  const format = /\.pdf$/i.test(out) ? 'pdf' : /\.html?$/i.test(out) ? 'html' : null;
  if (format === null) throw new InputError('must end in .pdf or .html', { field: '--out' });
  const well = args.string('well');
  const field = args.string('field');
  if (well === undefined && field === undefined) throw new InputError('missing: name the well (--well NAME) or the field (--field NAME) to report on', { field: '--well' });
  const limitC = args.number('limit-temp');
  const limit: ForecastLimit | undefined = limitC === undefined ? undefined : { kind: 'production-temperature', temperatureC: limitC };
  const units = args.string('units') as DisplayUnits | undefined;
  const paper = (args.string('paper') ?? 'a4') as Paper;
  const page = io.env.TAUWELL_REPORT_PAGE;

  const { report, model } = withServices(args, io, (s, fdb) => {
    const service = createReportService(s, fdb, { env: io.env, ...(page !== undefined && page !== '' ? { pageFile: resolve(io.cwd, page) } : {}) });
    const built = asOptions(() => {
      try {
        return service.buildModel({ ...(well !== undefined ? { well } : {}), ...(field !== undefined ? { field } : {}), ...(limit !== undefined ? { limit } : {}), ...(units !== undefined ? { units } : {}) });
      } catch (e) {
        // The limit is the command line's, whichever well refused it.
        if (e instanceof InputError && e.where.field?.startsWith('limit') === true) throw new InputError(e.reason, { field: '--limit-temp' });
        throw e;
      }
    });
    return { report: service, model: built };
  });

  const bytes = format === 'pdf' ? await report.renderReportPdf(model, { paper }) : Buffer.from(report.renderReportHtml(model, { paper }), 'utf8');
  const path = resolve(io.cwd, out);
  try {
    writeFileSync(path, bytes);
  } catch (e) {
    throw new InputError(`cannot write the report: ${e instanceof Error ? e.message : String(e)}`, { file: out, field: '--out' });
  }
  const wells = model.wells.length;
  const problems = model.wells.filter((w) => w.statement !== null).map((w) => w.well.name);
  io.stdout.write(
    `tauwell report: wrote ${out} (${format === 'pdf' ? `PDF, ${paper === 'a4' ? 'A4' : 'US Letter'}` : 'self-contained HTML'}, ${(bytes.length / 1024).toFixed(0)} KiB) — ` +
    `${model.title}, ${wells} well${wells === 1 ? '' : 's'}${problems.length > 0 ? `; without a forecast: ${problems.join(', ')}` : ''}` +
    `${model.meta.fingerprint === null ? '' : `; data fingerprint ${model.meta.fingerprint.slice(0, 16)}…`}\n`,
  );
  return 0;
}
