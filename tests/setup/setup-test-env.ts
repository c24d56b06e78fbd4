import { afterEach, beforeEach } from 'vitest';

// A console error fails the test that caused it: errors must be asserted, not printed.
let errors: unknown[][] = [];
const original = console.error;
beforeEach(() => {
  errors = [];
  console.error = (...args: unknown[]) => {
    errors.push(args);
    original(...args);
  };
});
afterEach(() => {
  console.error = original;
  if (errors.length) throw new Error(`console.error was called: ${String(errors[0]?.[0])}`);
});
