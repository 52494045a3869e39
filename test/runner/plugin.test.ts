/**
 * The plugin's translation of HyperFormula values into the host-neutral argument shapes
 * (src/functions/types.ts) and of the adapter's cell errors into HyperFormula errors.
 */
import { CellError, EmptyValue, ErrorType, SimpleRangeValue } from 'hyperformula';
import { describe, expect, it } from 'vitest';
import { toCellArg, toHfError } from '../../src/runner/plugin.js';

describe('HyperFormula values → CellArg', () => {
  it('passes numbers, text and logicals through and turns an empty cell into null (never 0)', () => {
    expect(toCellArg(2.5)).toBe(2.5);
    expect(toCellArg('abc')).toBe('abc');
    expect(toCellArg(true)).toBe(true);
    expect(toCellArg(EmptyValue)).toBeNull();
  });
  it('turns an error into an error cell with its Excel code and message', () => {
    expect(toCellArg(new CellError(ErrorType.DIV_BY_ZERO))).toEqual({ kind: 'error', code: '#DIV/0!' });
    expect(toCellArg(new CellError(ErrorType.NA, 'no value'))).toEqual({ kind: 'error', code: '#N/A', message: 'no value' });
  });
  it('turns a range into rows of cells, blanks and errors included', () => {
    const r = SimpleRangeValue.onlyValues([
      [1, EmptyValue],
      ['x', new CellError(ErrorType.VALUE)],
    ]);
    expect(toCellArg(r)).toEqual([
      [1, null],
      ['x', { kind: 'error', code: '#VALUE!' }],
    ]);
  });
  it('reads the plain number of a typed number (date, percent)', () => {
    expect(toCellArg({ val: 45000, format: 'dd/mm/yyyy' })).toBe(45000);
  });
});

describe('adapter cell errors → HyperFormula errors', () => {
  it('keeps the code and the message', () => {
    const e = toHfError({ code: '#VALUE!', message: 'knots: needs a whole number.' });
    expect([e.type, e.message]).toEqual([ErrorType.VALUE, 'knots: needs a whole number.']);
    expect(toHfError({ code: '#N/A', message: 'm' }).type).toBe(ErrorType.NA);
    expect(toHfError({ code: '#NUM!', message: 'm' }).type).toBe(ErrorType.NUM);
    expect(toHfError({ code: '#DIV/0!', message: '' }).type).toBe(ErrorType.DIV_BY_ZERO);
  });
  it('keeps a code HyperFormula lacks in the message', () => {
    const e = toHfError({ code: '#NULL!', message: 'weights: row 2 holds the error #NULL!.' });
    expect([e.type, e.message]).toEqual([ErrorType.ERROR, '#NULL! weights: row 2 holds the error #NULL!.']);
  });
});
