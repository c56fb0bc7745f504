/**
 * The memo's colours (docs: /work/shared/design-notes.md). Ink and one accent on white paper;
 * candidates in the Okabe-Ito colour-blind-safe order (Okabe and Ito 2008, "Color Universal
 * Design"), so a candidate has the same colour on every chart; correlations on a diverging
 * blue-white-red scale centred on zero (ColorBrewer RdBu, Brewer 2003).
 */
export const INK = '#1F2328';
export const MUTED = '#5C6066';
export const RULE = '#C9C4BA';
export const FAINT = '#EDEAE4';
export const ACCENT = '#1D5C63';
export const AMBER = '#B7791F';

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
  return CANDIDATE_COLOURS[index % CANDIDATE_COLOURS.length];
}

/** Negative to positive correlation. */
export const DIVERGING = ['#2166AC', '#67A9CF', '#D1E5F0', '#F7F7F7', '#FDDBC7', '#EF8A62', '#B2182B'];
