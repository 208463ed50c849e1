/**
 * Standard streams that never crash the CLI: a reader that goes away (`tilth ... | head`) ends the command
 * quietly, and text printed for people carries no terminal control sequences from the user's data (a sample id
 * holding ESC [ 2 J must not clear the screen or hide a warning).
 */

/** C0 controls except tab and newline, DEL, C1 controls; and whole ANSI/VT escape sequences. */
const ESCAPES = /\u001b\[[0-?]*[ -/]*[@-~]|\u001b\][^\u0007\u001b]*(\u0007|\u001b\\)?|\u001b[@-_]?/g;
const CONTROLS = /[\u0000-\u0008\u000b-\u001f\u007f-\u009f]/g;

/**
 * Text safe to print on a terminal: escape sequences removed, other control characters (but tab and newline)
 * removed, carriage returns dropped (a CR would let text overwrite the start of its line).
 * @example terminalSafe('zone \u001b[31mA\u001b[0m') // 'zone A'
 */
export function terminalSafe(text: string): string {
  return text.replace(ESCAPES, '').replace(CONTROLS, '');
}

/** True for an error from writing to a pipe or terminal whose reader has gone. */
export function isClosedPipe(e: unknown): boolean {
  const code = (e as NodeJS.ErrnoException)?.code;
  return code === 'EPIPE' || code === 'ERR_STREAM_DESTROYED' || code === 'ECONNRESET';
}

/**
 * Makes a closed stdout or stderr end the process quietly with the exit status set so far (0 by default),
 * instead of an unhandled 'error' event with a stack. Call once at start-up.
 * @example installStdioGuards()
 */
export function installStdioGuards(): void {
  for (const stream of [process.stdout, process.stderr]) {
    stream.on('error', (e) => {
      if (isClosedPipe(e)) process.exit(typeof process.exitCode === 'number' ? process.exitCode : 0);
      throw e;
    });
  }
}
