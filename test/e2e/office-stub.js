/**
 * A stand-in for office.js in the end-to-end test of the pane's Excel mode: the test serves this
 * file in place of Office's CDN script (playwright route), so the page runs its real Office-mode
 * code against a small in-memory workbook. It models only what the pane uses: Excel.run, sync,
 * worksheets (getItem, getActiveWorksheet, onChanged), ranges (values, valueTypes, formulas,
 * address, clear), tables with columns, and the selection. Properties are always readable (load
 * is a no-op). `window.__excelStub` lets the test edit cells, fire change events and select.
 */
(function () {
  'use strict';
  function letters(c) {
    let s = '';
    while (c > 0) {
      const m = (c - 1) % 26;
      s = String.fromCharCode(65 + m) + s;
      c = Math.floor((c - 1) / 26);
    }
    return s;
  }
  function number(l) {
    let n = 0;
    for (const ch of l.toUpperCase()) n = n * 26 + ch.charCodeAt(0) - 64;
    return n;
  }
  function parse(a) {
    const body = a.includes('!') ? a.slice(a.lastIndexOf('!') + 1) : a;
    const parts = body.replace(/\$/g, '').split(':');
    const m1 = /^([A-Z]+)(\d+)$/i.exec(parts[0]);
    const m2 = /^([A-Z]+)(\d+)$/i.exec(parts[1] || parts[0]);
    if (!m1 || !m2) throw new Error('stub: bad address ' + a);
    return { r1: +m1[2], c1: number(m1[1]), r2: +m2[2], c2: number(m2[1]) };
  }
  function name(r, c) {
    return letters(c) + r;
  }
  function a1(g) {
    const tl = name(g.r1, g.c1);
    return g.r1 === g.r2 && g.c1 === g.c2 ? tl : tl + ':' + name(g.r2, g.c2);
  }

  const sheets = new Map();
  let selection = { sheet: 'Trials', address: 'A1' };
  const tables = [];

  function sheetObject(sheetName) {
    if (!sheets.has(sheetName)) {
      const handlers = [];
      const cells = new Map();
      const ws = {
        name: sheetName,
        id: '{stub-' + sheetName + '}',
        cells,
        handlers,
        load() {
          return ws;
        },
        getRange(address) {
          return rangeObject(ws, parse(address));
        },
        getUsedRangeOrNullObject() {
          if (cells.size === 0) return { isNullObject: true, load() {} };
          const r = ws.getUsedRange();
          r.isNullObject = false;
          return r;
        },
        getUsedRange() {
          let g = null;
          for (const key of cells.keys()) {
            const p = parse(key);
            g = g ? { r1: Math.min(g.r1, p.r1), c1: Math.min(g.c1, p.c1), r2: Math.max(g.r2, p.r2), c2: Math.max(g.c2, p.c2) } : p;
          }
          return rangeObject(ws, g || { r1: 1, c1: 1, r2: 1, c2: 1 });
        },
        onChanged: {
          add(h) {
            handlers.push(h);
            return {
              context,
              remove() {
                const i = handlers.indexOf(h);
                if (i >= 0) handlers.splice(i, 1);
              },
            };
          },
        },
      };
      sheets.set(sheetName, ws);
    }
    return sheets.get(sheetName);
  }

  function rangeObject(ws, g) {
    const grid = (f) => {
      const out = [];
      for (let r = g.r1; r <= g.r2; r++) {
        const row = [];
        for (let c = g.c1; c <= g.c2; c++) row.push(f(ws.cells.get(name(r, c))));
        out.push(row);
      }
      return out;
    };
    const range = {
      load() {
        return range;
      },
      get address() {
        return (/^[A-Za-z_][A-Za-z0-9_]*$/.test(ws.name) ? ws.name : "'" + ws.name + "'") + '!' + a1(g);
      },
      get rowCount() {
        return g.r2 - g.r1 + 1;
      },
      get columnCount() {
        return g.c2 - g.c1 + 1;
      },
      get values() {
        return grid((cell) => (cell === undefined ? '' : cell.value));
      },
      get valueTypes() {
        return grid((cell) => {
          if (cell === undefined || cell.value === '') return 'Empty';
          if (typeof cell.value === 'number') return 'Double';
          if (typeof cell.value === 'boolean') return 'Boolean';
          if (typeof cell.value === 'string' && cell.value.startsWith('#')) return 'Error';
          return 'String';
        });
      },
      get formulas() {
        return grid((cell) => (cell === undefined ? '' : cell.formula || cell.value));
      },
      set values(v) {
        for (let r = 0; r < v.length; r++) {
          for (let c = 0; c < v[r].length; c++) ws.cells.set(name(g.r1 + r, g.c1 + c), { value: v[r][c] });
        }
      },
      // The stub does not calculate: a formula's result is its own cell, or the area set with `spill`.
      getSpillingToRangeOrNullObject() {
        const cell = ws.cells.get(name(g.r1, g.c1));
        if (!cell || !cell.spill) return { isNullObject: true, load() {} };
        const r = rangeObject(ws, parse(cell.spill));
        r.isNullObject = false;
        return r;
      },
      set formulas(f) {
        for (let r = 0; r < f.length; r++) {
          for (let c = 0; c < f[r].length; c++) {
            const text = f[r][c];
            // A formula shows a placeholder value here (the stub does not calculate).
            ws.cells.set(name(g.r1 + r, g.c1 + c), String(text).startsWith('=') ? { value: '(formula)', formula: text } : { value: text });
          }
        }
      },
      clear() {
        for (let r = g.r1; r <= g.r2; r++) for (let c = g.c1; c <= g.c2; c++) ws.cells.delete(name(r, c));
        window.__excelStub.cleared.push(range.address);
      },
      getIntersection(other) {
        const h = { r1: Math.max(g.r1, other.g.r1), c1: Math.max(g.c1, other.g.c1), r2: Math.min(g.r2, other.g.r2), c2: Math.min(g.c2, other.g.c2) };
        if (h.r1 > h.r2 || h.c1 > h.c2) throw new Error('stub: no intersection');
        return rangeObject(ws, h);
      },
      g,
    };
    return range;
  }

  const context = {
    workbook: {
      worksheets: {
        getItem(n) {
          return sheetObject(n);
        },
        getActiveWorksheet() {
          return sheetObject(selection.sheet);
        },
        load() {},
        get items() {
          return [...sheets.values()];
        },
        add(n) {
          return sheetObject(n);
        },
      },
      tables: {
        load() {},
        get items() {
          return tables.map((t) => ({
            name: t.name,
            columns: {
              load() {},
              items: t.columns.map((col, i) => ({
                name: col,
                getDataBodyRange() {
                  const p = parse(t.address);
                  return rangeObject(sheetObject(t.sheet), { r1: p.r1 + 1, r2: p.r2, c1: p.c1 + i, c2: p.c1 + i });
                },
              })),
            },
          }));
        },
      },
      getSelectedRange() {
        return sheetObject(selection.sheet).getRange(selection.address);
      },
    },
    sync() {
      return Promise.resolve();
    },
  };

  window.Excel = {
    run(batch) {
      return Promise.resolve().then(() => batch(context));
    },
  };
  window.Office = {
    HostType: { Excel: 'Excel' },
    onReady() {
      return Promise.resolve({ host: 'Excel', platform: 'PC' });
    },
  };
  window.CustomFunctions = {
    associate() {
      window.__excelStub.associated += 1;
    },
    Error: class extends Error {
      constructor(code, message) {
        super(message);
        this.code = code;
      }
    },
  };
  window.OfficeExtension = {};

  window.__excelStub = {
    associated: 0,
    cleared: [],
    set(sheetName, address, value, formula, spill) {
      sheetObject(sheetName).cells.set(address, formula ? (spill ? { value, formula, spill } : { value, formula }) : { value });
    },
    cellsOf(sheetName) {
      return sheets.has(sheetName) ? Object.fromEntries(sheets.get(sheetName).cells) : null;
    },
    get(sheetName, address) {
      return sheetObject(sheetName).cells.get(address) || null;
    },
    change(sheetName, address) {
      const ws = sheetObject(sheetName);
      for (const h of ws.handlers.slice()) h({ address, worksheetId: ws.id, changeType: 'RangeEdited', source: 'Local' });
      return ws.handlers.length;
    },
    select(sheetName, address) {
      selection = { sheet: sheetName, address };
    },
    addTable(tableName, sheetName, address, columns) {
      tables.push({ name: tableName, sheet: sheetName, address, columns });
    },
  };
})();
