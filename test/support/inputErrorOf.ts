import { expect } from 'vitest';
import { InputError } from '../../src/errors.js';

/** The InputError `run` throws; fails the test when it throws nothing or something else. */
export function inputErrorOf(run: () => unknown): InputError {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(InputError);
    return error as InputError;
  }
  throw new Error('expected an InputError, none was thrown');
}
