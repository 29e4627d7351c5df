// `npm run bench` (after `npm run build:cli`): runs the benchmark sections named on the command line, or all
// of them, prints each as a Markdown table, writes bench/results/<section>.json, and exits 1 if any target
// was missed.
//   node bench/run.mjs [section ...] [--quick]
// A section is a module exporting `title` and `run({ quick })`, which resolves to
// `{ markdown, json, failed }`; add one by adding it to SECTIONS.
import { mkdirSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { peakRssMiB } from './lib.mjs';

const SECTIONS = {
  fit: './fit.mjs',
  import: './import.mjs',
  chart: './decline-chart.mjs',
};

const USAGE = `usage: node bench/run.mjs [section ...] [--quick]
  sections: ${Object.keys(SECTIONS).join(', ')} (default: all)
  --quick   skip the slowest baselines (the 1,000,000-point ml-levenberg-marquardt fit) and make the
            chart section's large well 200,000 readings`;

function parseArgs(argv) {
  const names = [];
  let quick = false;
  for (const arg of argv) {
    if (arg === '--quick') quick = true;
    else if (arg === '--help' || arg === '-h') return { help: true };
    else if (arg in SECTIONS) names.push(arg);
    else return { error: `unknown section or option "${arg}"` };
  }
  return { names: names.length > 0 ? names : Object.keys(SECTIONS), quick };
}

async function main() {
  const args = parseArgs(process.argv.slice(2));
  if (args.help) { console.log(USAGE); return 0; }
  if (args.error) { console.error(`${args.error}\n${USAGE}`); return 2; }

  const resultsDir = fileURLToPath(new URL('./results/', import.meta.url));
  mkdirSync(resultsDir, { recursive: true });
  if (args.quick) console.log('Quick run (--quick): the slowest baselines are skipped; their ratios are not measured.\n');

  let failed = false;
  for (const name of args.names) {
    let section;
    try {
      section = await import(SECTIONS[name]);
    } catch (err) {
      if (err?.code === 'ERR_MODULE_NOT_FOUND' && String(err.message).includes('/dist/')) {
        console.error(`bench: ${err.message}\nbench: the benchmarks run the compiled engine; build it first with \`npm run build:cli\`.`);
        return 2;
      }
      throw err;
    }
    const started = new Date();
    const result = await section.run({ quick: args.quick });
    const json = {
      section: name, title: section.title, startedAt: started.toISOString(),
      seconds: (Date.now() - started.getTime()) / 1000, node: process.version, processPeakRssMiB: peakRssMiB(),
      failed: result.failed, ...result.json,
    };
    writeFileSync(`${resultsDir}${name}.json`, `${JSON.stringify(json, null, 2)}\n`);
    console.log(`## ${section.title}\n\n${result.markdown}\n`);
    console.log(`${result.failed ? 'FAILED: a target was missed' : 'All targets met'}; figures in bench/results/${name}.json\n`);
    failed ||= result.failed;
  }
  return failed ? 1 : 0;
}

process.exitCode = await main();
