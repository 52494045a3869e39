/**
 * The README for a user: every in-page link (the table of contents, and the links to the one
 * Cautions section) lands on a heading of the help page, whose anchors are those of
 * scripts/help-page.mjs (`headingAnchors`, GitHub's rule: lower case, punctuation dropped, spaces
 * to hyphens, "-1" for a repeat); and the top-level sections come in a user's order.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { headingAnchors } from '../../scripts/help-page.mjs';

const readme = readFileSync(fileURLToPath(new URL('../../README.md', import.meta.url)), 'utf8');

describe('README structure', () => {
  it('every in-page link [text](#anchor) names an anchor of a heading', () => {
    const anchors = new Set(headingAnchors(readme));
    const links = [...readme.matchAll(/\]\(#([^)\s]+)\)/g)].map((m) => m[1]!);
    expect(links.length).toBeGreaterThan(20);
    expect(links.filter((a) => !anchors.has(a))).toEqual([]);
  });

  it('the contents list every top-level section, and the sections run from quick start to tests and contributing', () => {
    const top = [...readme.matchAll(/^## (.+)$/gm)].map((m) => m[1]!.trim());
    const contents = readme.split('\n## Contents\n')[1]!.split('\n## ')[0]!;
    for (const t of top.filter((t) => t !== 'Contents')) expect(contents).toContain(`- [${t}](#`);
    const at = (t: string) => top.indexOf(t);
    const order = ['Contents', 'Quick start', 'Function reference', 'The task pane', 'Sharing with your team', 'Running workbooks without Excel', 'The methods', 'Tests and contributing'];
    for (const t of order) expect(at(t), t).toBeGreaterThanOrEqual(0);
    expect(order.map(at)).toEqual([...order.map(at)].sort((a, b) => a - b));
  });

  it('states the cautions once: one section "Cautions", linked from the function reference, the task pane and the runner', () => {
    expect(readme.match(/^#{2,4} Cautions$/gm)).toEqual(['## Cautions']);
    for (const section of ['## Function reference', '## The task pane', '## Running workbooks without Excel']) {
      const text = readme.split(`\n${section}\n`)[1]!.split('\n## ')[0]!;
      expect(text, section).toContain('[Cautions](#cautions)');
    }
  });
});
