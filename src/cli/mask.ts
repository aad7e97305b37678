import type { Command } from 'commander';
import { InputError } from '../errors.js';
import { formatMaskResult, maskScenario } from '../jobs/finders.js';
import { loadScenario } from '../scenario/index.js';
import { withExactOrbit } from './run.js';
import { examples } from './examples.js';
import { printNotices } from './notices.js';

export function register(program: Command): void {
  program
    .command('mask')
    .description('elevation-mask finder: lowest mask meeting the required margin, and daily volume against mask 0–30° (mask.csv)')
    .argument('<scenario>', 'scenario file (YAML or JSON)')
    .option('--fraction <f>', 'fraction of time above the mask that must meet the margin (0 < f ≤ 1; default the scenario, else 1)')
    .option('--out <dir>', 'output folder (default out/<scenario name>)')
    .option('--quiet', 'no progress bar and no table')
    .option('--exact-orbit', 'SGP4 at every step instead of interpolating between SGP4 nodes (slower; a check)')
    .addHelpText('after', examples([
      ['passbudget mask fixtures/demo/scenario.yaml', 'lowest mask where every step above it meets the margin; mask.csv and mask.json'],
      ['passbudget mask my.yaml --fraction 0.95 --out results/mask', 'where 95 % of the time above the mask does'],
    ]))
    .action(async (file: string, o: { fraction?: string; out?: string; quiet?: boolean; exactOrbit?: boolean }) => {
      let fraction: number | undefined;
      if (o.fraction !== undefined) {
        fraction = Number(o.fraction);
        if (!(fraction > 0 && fraction <= 1)) throw new InputError(`--fraction: ${JSON.stringify(o.fraction)} is out of range (allowed a number 0 < f ≤ 1)`);
      }
      const scenario = withExactOrbit(loadScenario(file, { outDir: o.out }), o.exactOrbit);
      printNotices(scenario);
      const r = await maskScenario(scenario, { outDir: o.out, quiet: o.quiet, fraction });
      if (!o.quiet) process.stdout.write(`${formatMaskResult(r)}\n`);
    });
}
