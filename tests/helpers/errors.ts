/** Expecting a user error (exit 2 in the CLI): its message, or the test fails. */
import { expect } from 'vitest';
import { isUserError } from '../../src/errors.js';

/**
 * The message of the UserError `f` throws; the test fails when `f` throws another error or nothing.
 * @example expect(userErrorMessage(() => parsePlan('crop: 7', 'plan.yaml', tables))).toMatch(/crop/)
 */
export function userErrorMessage(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    expect(isUserError(e)).toBe(true);
    return (e as Error).message;
  }
  throw new Error('expected a UserError');
}

/**
 * The message of the UserError a promise rejects with; the test fails when it rejects with another error or
 * resolves.
 * @example expect(await rejectedUserError(readLayer(files, 'rx.shp'))).toMatch(/dbf/)
 */
export async function rejectedUserError(p: Promise<unknown>): Promise<string> {
  try {
    await p;
  } catch (e) {
    expect(isUserError(e)).toBe(true);
    return (e as Error).message;
  }
  throw new Error('expected a UserError');
}
