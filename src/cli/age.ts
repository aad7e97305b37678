import type { Command } from 'commander';
import { InputError } from '../errors.js';
import { elementAgeScenario, formatElementAgeResult } from '../jobs/age.js';
import { loadScenario } from '../scenario/index.js';
import { withExactOrbit } from './run.js';
import { examples } from './examples.js';
import { printNotices } from './notices.js';

const days = (flag: string, v: string | undefined): number | undefined => {
  if (v === undefined) return undefined;
  const x = Number(v);
  if (v.trim() === '' || !Number.isFinite(x)) throw new InputError(`${flag}: ${JSON.stringify(v)} is not a number of days (allowed e.g. 14)`);
  return x;
};

export function register(program: Command): void {
  program
    .command('age')
    .description('element-age curve: daily volume and usable passes with the element sets held 0–14 days old (element_age.csv)')
    .argument('<scenario>', 'scenario file (YAML or JSON)')
    .option('--max-days <d>', 'oldest element age to try (days, 0–60; default 14)')
    .option('--step-days <d>', 'step between ages (days; default 1)')
    .option('--out <dir>', 'output folder (default out/<scenario name>)')
    .option('--quiet', 'no progress bar and no table')
    .option('--exact-orbit', 'SGP4 at every step instead of interpolating between SGP4 nodes (slower; a check)')
    .addHelpText('after', examples([
      ['passbudget age fixtures/demo/scenario.yaml', 'daily volume per link against element age 0–14 days; element_age.csv and element_age.json'],
      ['passbudget age my.yaml --max-days 7 --step-days 0.5', 'half-day steps over a week'],
    ]))
    .action(async (file: string, o: { maxDays?: string; stepDays?: string; out?: string; quiet?: boolean; exactOrbit?: boolean }) => {
      const maxAgeDays = days('--max-days', o.maxDays);
      const stepDays = days('--step-days', o.stepDays);
      const scenario = withExactOrbit(loadScenario(file, { outDir: o.out }), o.exactOrbit);
      printNotices(scenario);
      const r = await elementAgeScenario(scenario, { outDir: o.out, quiet: o.quiet, maxAgeDays, stepDays });
      if (!o.quiet) process.stdout.write(`${formatElementAgeResult(r)}\n`);
    });
}
