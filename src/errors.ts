/**
 * Errors that carry a one-line, user-facing message.
 *
 * `InputError` is bad input (a file, a flag, a scenario field): the CLI prints
 * its message alone on stderr and exits with code 2, before touching outputs.
 * The message follows `WHERE: what is wrong (what is allowed)`, where WHERE is
 * `FILE:LINE:COLUMN`, `FILE:LINE path`, `--flag` or a scenario path.
 */
export class InputError extends Error {
  override readonly name = 'InputError';
  constructor(message: string) {
    super(message.replace(/\s*\n\s*/g, ' '));
  }
}

/** Propagation failed (SGP4 error code, decay): user-facing, exit code 2. */
export class PropagationError extends InputError {
  override readonly name = 'InputError';
}

/**
 * Writing the outputs failed for a reason outside the program (a full disk,
 * a read-only or unwritable folder): one line naming the folder, what failed
 * and, where known, the space needed. Exit code 1, but not an internal error.
 */
export class OutputError extends Error {
  override readonly name = 'OutputError';
  constructor(message: string) {
    super(message.replace(/\s*\n\s*/g, ' '));
  }
}
