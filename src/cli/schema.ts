/**
 * `passbudget schema`: print the scenario file's JSON Schema (2020-12), or
 * write it to a file. Wiring only: the schema comes from the library.
 */
import type { Command } from 'commander';
import { InputError } from '../errors.js';
import { writeFileAtomic } from '../output/atomic.js';
import { scenarioJsonSchema } from '../scenario/index.js';
import { examples } from './examples.js';

export function register(program: Command): void {
  program
    .command('schema')
    .description('Print the JSON Schema (2020-12) of the scenario file')
    .option('--out <file>', 'write the schema to this file instead of stdout')
    .addHelpText('after', examples([
      ['passbudget schema --out scenario.schema.json', 'for an editor: # yaml-language-server: $schema=scenario.schema.json'],
      ['passbudget schema | head', 'print it'],
    ]))
    .action((opts: { out?: string }) => {
      const text = `${JSON.stringify(scenarioJsonSchema(), null, 2)}\n`;
      if (opts.out !== undefined) {
        try {
          writeFileAtomic(opts.out, text);
        } catch (e) {
          throw new InputError(`--out: cannot write ${opts.out} (${e instanceof Error ? e.message : String(e)}; allowed a writable file path)`);
        }
      }
      else process.stdout.write(text);
    });
}
