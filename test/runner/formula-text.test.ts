/** Specification of the stored ↔ typed formula forms and of the runner's cell references. */
import { describe, expect, it } from 'vitest';
import { callsRatchet, toStoredForm, toTypedForm } from '../../src/runner/formula-text.js';
import { columnIndex, columnLetters, parseCellRef, parseRange } from '../../src/runner/address.js';

describe('formula forms', () => {
  it('reads the stored form Excel writes for add-in functions as the typed form', () => {
    expect(toTypedForm('_xldudf_RATCHET_FIT(B2:B9,A2:A9)')).toBe('RATCHET.FIT(B2:B9,A2:A9)');
    expect(toTypedForm('ROUND(_xldudf_RATCHET_PREDICT(5,B2:B9,A2:A9),2)')).toBe('ROUND(RATCHET.PREDICT(5,B2:B9,A2:A9),2)');
    expect(toTypedForm('_xldudf_ratchet_knots(B2:B9,A2:A9,_xlfn.SEQUENCE(3))')).toBe('RATCHET.KNOTS(B2:B9,A2:A9,SEQUENCE(3))');
  });
  it('writes the typed form as the stored form, prefixing newer built-ins as Excel does', () => {
    expect(toStoredForm('=RATCHET.CV(B2:B9,A2:A9,SEQUENCE(19,1,2))')).toBe('=_xldudf_RATCHET_CV(B2:B9,A2:A9,_xlfn.SEQUENCE(19,1,2))');
    expect(toStoredForm('_xldudf_RATCHET_FIT(B2:B9,A2:A9)')).toBe('_xldudf_RATCHET_FIT(B2:B9,A2:A9)');
    expect(toStoredForm('SUM(A1:A3)')).toBe('SUM(A1:A3)');
  });
  it('leaves text inside string literals alone', () => {
    expect(toTypedForm('CONCAT("_xldudf_RATCHET_FIT(",_xldudf_RATCHET_BESTK(B2:B9,A2:A9))')).toBe('CONCAT("_xldudf_RATCHET_FIT(",RATCHET.BESTK(B2:B9,A2:A9))');
    expect(toStoredForm('"RATCHET.FIT(" & "x"')).toBe('"RATCHET.FIT(" & "x"');
  });
  it('recognises calls in either form only', () => {
    expect(callsRatchet('=RATCHET.FIT(A1:A3,B1:B3)')).toBe(true);
    expect(callsRatchet('_xldudf_RATCHET_STATS(A1:A3,B1:B3)')).toBe(true);
    expect(callsRatchet('=SUM(A1:A3)')).toBe(false);
    expect(callsRatchet('=MYRATCHET.FIT(A1)')).toBe(false);
  });
});

describe('cell references', () => {
  it('converts column letters both ways', () => {
    expect([columnLetters(0), columnLetters(25), columnLetters(26), columnLetters(701), columnLetters(702)]).toEqual(['A', 'Z', 'AA', 'ZZ', 'AAA']);
    expect([columnIndex('A'), columnIndex('z'), columnIndex('AA'), columnIndex('XFD')]).toEqual([0, 25, 26, 16383]);
  });
  it('parses Sheet!A1 with quoted names and $ markers, and names what is wrong otherwise', () => {
    expect(parseCellRef('Data!B7')).toEqual({ sheet: 'Data', row: 6, col: 1 });
    expect(parseCellRef("'My data'!$C$10")).toEqual({ sheet: 'My data', row: 9, col: 2 });
    expect(() => parseCellRef('B7')).toThrow('"B7" is not a cell reference of the form Sheet!A1');
    expect(() => parseCellRef('Data!7B')).toThrow('"Data!7B" is not a cell reference of the form Sheet!A1');
    expect(parseRange('B2:C5')).toEqual({ top: 1, left: 1, bottom: 4, right: 2 });
  });
});
