/** Types of scripts/help-page.mjs (the help page built from README.md). */
export function headingAnchor(text: string): string;
export function headingAnchors(markdown: string): string[];
export function renderHelpPage(readmePath: string): string;
