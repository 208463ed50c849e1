/**
 * A problem with the user's input or options, not a bug in tilth.
 *
 * The message must let a farmer's agronomist act on it: it names the file, the feature or row,
 * the field, the value and the fix. The CLI prints only the message (no stack) and exits 2.
 *
 * @example
 * throw new UserError('samples.csv row 14, column "P": "abc" is not a number. Fix: enter a number, or leave it empty if not tested.');
 */
export class UserError extends Error {
  override readonly name = 'UserError';
  constructor(
    message: string,
    readonly details: { file?: string; where?: string; field?: string; value?: unknown } = {},
  ) {
    super(message);
  }
}

/** True for errors the CLI should report as user errors (exit 2, no stack). */
export function isUserError(e: unknown): e is UserError {
  return (
    e instanceof UserError ||
    (typeof e === 'object' && e !== null && (e as { name?: string }).name === 'UserError')
  );
}

/**
 * A non-fatal finding, shown to the user and carried into every output that is built from the data.
 * `code` is stable (scripts may match on it); `message` is for people.
 */
export interface Warning {
  code: string;
  message: string;
  file?: string;
  /** feature index / sample id / CSV row the warning refers to */
  where?: string;
  field?: string;
}
