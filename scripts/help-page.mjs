// Builds the add-in's help page (help.html) from README.md, so that each worksheet function's help
// link (https://<add-in host>/help.html#ratchet<name>) lands on its section of the README.
// Used by webpack.config.js at build time and by the tests; plain ESM so both can import it.
import { readFileSync } from 'node:fs';
import { Marked } from 'marked';

/**
 * Anchor of a heading, as GitHub forms it: lower case, characters other than letters, digits,
 * spaces and hyphens removed, spaces turned into hyphens. "RATCHET.FIT" → "ratchetfit".
 * @param {string} text heading text (inline markdown already stripped)
 * @returns {string}
 */
export function headingAnchor(text) {
  return text
    .trim()
    .toLowerCase()
    .replace(/<[^>]*>/g, '')
    .replace(/[^\p{L}\p{N}\s-]/gu, '')
    .replace(/\s/g, '-');
}

/**
 * The anchors of every heading in a markdown text, in order (repeats get -1, -2, … as on GitHub).
 * @param {string} markdown
 * @returns {string[]}
 */
export function headingAnchors(markdown) {
  const seen = new Map();
  const out = [];
  const lexer = new Marked();
  for (const token of lexer.lexer(markdown)) {
    if (token.type !== 'heading') continue;
    const base = headingAnchor(token.text.replace(/[`*_]/g, ''));
    const count = seen.get(base) ?? 0;
    seen.set(base, count + 1);
    out.push(count === 0 ? base : `${base}-${count}`);
  }
  return out;
}

/**
 * The help page: README.md rendered to one self-contained HTML page with an id on every heading
 * and a strict Content-Security-Policy (no scripts at all).
 * @param {string} readmePath path of README.md
 * @returns {string} the HTML text
 */
export function renderHelpPage(readmePath) {
  const markdown = readFileSync(readmePath, 'utf8');
  const anchors = headingAnchors(markdown);
  let index = 0;
  const marked = new Marked({
    gfm: true,
    renderer: {
      heading({ tokens, depth }) {
        const id = anchors[index++] ?? '';
        return `<h${depth} id="${id}">${this.parser.parseInline(tokens)}</h${depth}>\n`;
      },
    },
  });
  const body = marked.parse(markdown, { async: false });
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src 'self' data:">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Ratchet — help</title>
<style>
  :root { color-scheme: light dark; }
  body { font: 15px/1.5 system-ui, sans-serif; max-width: 58rem; margin: 2rem auto; padding: 0 1rem; }
  code, pre { font-family: ui-monospace, monospace; font-size: 0.92em; }
  pre { overflow-x: auto; padding: 0.6rem; border: 1px solid #8884; }
  table { border-collapse: collapse; margin: 0.5rem 0; }
  th, td { border: 1px solid #8886; padding: 0.2rem 0.5rem; text-align: left; vertical-align: top; }
  :target { outline: 2px solid #d97706; outline-offset: 4px; }
</style>
</head>
<body>
${body}
</body>
</html>
`;
}
