/** The "Examples:" block at the end of a command's --help (commander `addHelpText('after', …)`). */
export function examples(list: readonly (readonly [command: string, what: string])[]): string {
  return `\nExamples:\n${list.map(([c, w]) => `  $ ${c}\n      ${w}`).join('\n')}\n`;
}
