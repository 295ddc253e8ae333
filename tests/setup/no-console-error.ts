// Any console.error during a test is a failure: errors must be handled or asserted, not printed.
import { afterEach, beforeEach, vi } from 'vitest';

let errors: unknown[][] = [];
beforeEach(() => {
  errors = [];
  vi.spyOn(console, 'error').mockImplementation((...args: unknown[]) => {
    errors.push(args);
  });
});
afterEach(() => {
  vi.mocked(console.error).mockRestore();
  if (errors.length) throw new Error(`console.error was called during the test:\n${errors.map((a) => a.map(String).join(' ')).join('\n')}`);
});
