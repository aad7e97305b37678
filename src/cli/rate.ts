import type { Command } from 'commander';
import { InputError } from '../errors.js';
import { formatRateResult, rateScenario } from '../jobs/finders.js';
import { loadScenario } from '../scenario/index.js';
import { withExactOrbit } from './run.js';
import { examples } from './examples.js';
import { printNotices } from './notices.js';

/** `--rates 9600,19200` or `--rates 1000:1000000:13` (13 log-spaced rates from 1 kb/s to 1 Mb/s). */
export function parseRates(text: string): number[] {
  const range = /^\s*([\d.e+]+)\s*:\s*([\d.e+]+)\s*:\s*(\d+)\s*$/i.exec(text);
  const bad = () => new InputError(`--rates: ${JSON.stringify(text)} is not a rate list (allowed b/s values like 9600,19200 or MIN:MAX:COUNT like 1000:1000000:13)`);
  if (range) {
    const lo = Number(range[1]); const hi = Number(range[2]); const n = Number(range[3]);
    if (!(lo > 0 && hi > lo && n >= 2 && n <= 1000)) throw bad();
    return Array.from({ length: n }, (_, i) => Math.round(lo * (hi / lo) ** (i / (n - 1))));
  }
  const list = text.split(',').map((s) => Number(s.trim()));
  if (list.length === 0 || list.some((r) => !(r > 0) || !Number.isFinite(r))) throw bad();
  return list;
}

export function register(program: Command): void {
  program
    .command('rate')
    .description('data-rate finder: daily volume against bit rate for fixed-rate links, and the best rate (rate.csv)')
    .argument('<scenario>', 'scenario file (YAML or JSON)')
    .option('--rates <list>', 'bit rates in b/s: 9600,19200,... or MIN:MAX:COUNT (log-spaced); default the scenario')
    .option('--out <dir>', 'output folder (default out/<scenario name>)')
    .option('--quiet', 'no progress bar and no table')
    .option('--exact-orbit', 'SGP4 at every step instead of interpolating between SGP4 nodes (slower; a check)')
    .addHelpText('after', examples([
      ['passbudget rate fixtures/demo/scenario.yaml', 'daily volume against the scenario\'s bit rates; rate.csv'],
      ['passbudget rate my.yaml --rates 1000:4000000:25', '25 log-spaced rates from 1 kb/s to 4 Mb/s'],
    ]))
    .action(async (file: string, o: { rates?: string; out?: string; quiet?: boolean; exactOrbit?: boolean }) => {
      const ratesBps = o.rates !== undefined ? parseRates(o.rates) : undefined;
      const scenario = withExactOrbit(loadScenario(file, { outDir: o.out }), o.exactOrbit);
      printNotices(scenario);
      const r = await rateScenario(scenario, { outDir: o.out, quiet: o.quiet, ratesBps });
      if (!o.quiet) process.stdout.write(`${formatRateResult(r)}\n`);
    });
}
