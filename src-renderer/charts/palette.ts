/**
 * Chart colours (shared/design-notes.md). Candidates take the Okabe-Ito colour-blind-safe palette
 * (Okabe and Ito 2008, "Color Universal Design") in one fixed order, so a candidate keeps its
 * colour on every chart; the order matches the memo's (src-main/memo/palette.ts). Correlations use
 * a diverging blue-white-red scale centred on zero (ColorBrewer RdBu, Brewer 2003).
 */
export const INK = '#1F2328';
export const INK_SOFT = '#4A5058';
export const RULE = '#D9D3C7';
export const PAPER = '#FAF8F4';
export const ACCENT = '#1D5C63';
export const AMBER = '#A35F00';

export const CANDIDATE_COLOURS = [
  '#E69F00',
  '#56B4E9',
  '#009E73',
  '#0072B2',
  '#D55E00',
  '#CC79A7',
  '#F0E442',
  '#000000',
];

export function candidateColour(index: number): string {
  return CANDIDATE_COLOURS[((index % CANDIDATE_COLOURS.length) + CANDIDATE_COLOURS.length) % CANDIDATE_COLOURS.length];
}

/** Candidate marks besides colour, so no chart relies on colour alone (WCAG 2.2, 1.4.1). */
export const CANDIDATE_SYMBOLS = ['circle', 'rect', 'triangle', 'diamond', 'pin', 'arrow', 'roundRect', 'circle'];

export function candidateSymbol(index: number): string {
  return CANDIDATE_SYMBOLS[index % CANDIDATE_SYMBOLS.length];
}

/** Negative to positive correlation. */
export const DIVERGING = ['#2166AC', '#67A9CF', '#D1E5F0', '#F7F7F7', '#FDDBC7', '#EF8A62', '#B2182B'];

export const FONT = "'Source Sans 3', 'Segoe UI', 'Noto Sans', 'DejaVu Sans', Helvetica, Arial, sans-serif";
