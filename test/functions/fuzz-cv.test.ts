/** Fuzz of cross-validation: see fuzz-arbitraries.ts for the generators and the property. */
import { describe } from 'vitest';
import { fuzzFunction } from './fuzz-arbitraries.js';

describe('fuzz: cross-validation', () => {
  fuzzFunction('CV');
  fuzzFunction('BESTK');
});
