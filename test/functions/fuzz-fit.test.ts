/** Fuzz of the fitting functions: see fuzz-arbitraries.ts for the generators and the property. */
import { describe } from 'vitest';
import { fuzzFunction } from './fuzz-arbitraries.js';

describe('fuzz: the fitting functions', () => {
  fuzzFunction('FIT');
  fuzzFunction('PREDICT');
  fuzzFunction('KNOTS');
  fuzzFunction('STATS');
  fuzzFunction('BAND');
  fuzzFunction('INVERTBAND');
});
