/** Fuzz of the knot-table functions: see fuzz-arbitraries.ts for the generators and the property. */
import { describe } from 'vitest';
import { fuzzFunction } from './fuzz-arbitraries.js';

describe('fuzz: the knot-table functions', () => {
  fuzzFunction('EVAL');
  fuzzFunction('INVERT');
  fuzzFunction('QKNOTS');
});
