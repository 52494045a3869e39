/**
 * The knot-count axis of the pane's cross-validation chart: the 0 tick says "classic" only when
 * the classic fit (knot count 0) is one of the candidates drawn; otherwise every tick is its count.
 */
import { describe, expect, it } from 'vitest';
import { knotTick } from '../../taskpane/charts.js';

describe('cross-validation chart ticks', () => {
  it('labels 0 "classic" only with the classic fit among the candidates', () => {
    expect([0, 2, 4].map((k) => knotTick(k, true))).toEqual(['classic', '2', '4']);
    expect([0, 2, 4].map((k) => knotTick(k, false))).toEqual(['0', '2', '4']);
  });
});
