/**
 * Holdfast's one palette, read by the screens (as CSS custom properties and by the charts) and by
 * the memo. Warm paper, near-black ink, one petrol accent for what can be pressed, amber for a
 * caution (never the only carrier of meaning: a word goes with it, WCAG 2.2, 1.4.1).
 *
 * Candidates take the Okabe-Ito colour-blind-safe palette (Okabe and Ito 2008, "Color Universal
 * Design") in one fixed order, so a candidate keeps its colour on every chart and in the memo.
 * Correlations use a diverging blue-white-red scale centred on zero (ColorBrewer RdBu, Brewer 2003).
 */
export const PAPER = '#FAF8F4';
export const PAPER_DEEP = '#F2EEE6';
export const SHEET = '#FFFFFF';
export const INK = '#1F2328';
/** Secondary text: axis labels, units, captions. */
export const INK_SOFT = '#4A5058';
export const INK_FAINT = '#6E747C';
export const RULE = '#D9D3C7';
export const RULE_SOFT = '#E8E3D9';
/** Borders of inputs, which need more contrast than a table rule (WCAG 2.2, 1.4.11). */
export const RULE_STRONG = '#B9B2A4';
export const ACCENT = '#1D5C63';
export const ACCENT_INK = '#FFFFFF';
export const ACCENT_WASH = '#E3EEEE';
/** Cautions and infeasible candidates: 4.9:1 on the paper, so amber text stays legible. */
export const AMBER = '#A35F00';
export const AMBER_WASH = '#FBF0DC';
export const AMBER_RULE = '#E5CF9F';
export const DANGER = '#9B2C2C';
export const DANGER_WASH = '#F9E6E4';
export const OK = '#2F6B3A';
export const FOCUS = '#C77700';

/** The CSS custom properties the screens' style sheets use, from the constants above. */
export const CSS_COLOURS: Readonly<Record<string, string>> = {
  '--paper': PAPER,
  '--paper-deep': PAPER_DEEP,
  '--sheet': SHEET,
  '--ink': INK,
  '--ink-soft': INK_SOFT,
  '--ink-faint': INK_FAINT,
  '--rule': RULE,
  '--rule-soft': RULE_SOFT,
  '--rule-strong': RULE_STRONG,
  '--accent': ACCENT,
  '--accent-ink': ACCENT_INK,
  '--accent-wash': ACCENT_WASH,
  '--amber': AMBER,
  '--amber-wash': AMBER_WASH,
  '--amber-rule': AMBER_RULE,
  '--danger': DANGER,
  '--danger-wash': DANGER_WASH,
  '--ok': OK,
  '--focus': FOCUS,
};

export const CANDIDATE_COLOURS = [
  '#E69F00',
  '#56B4E9',
  '#009E73',
  '#0072B2',
  '#D55E00',
  '#CC79A7',
  '#F0E442',
  '#000000',
] as const;

export function candidateColour(index: number): string {
  const n = CANDIDATE_COLOURS.length;
  return CANDIDATE_COLOURS[((index % n) + n) % n];
}

/** Candidate marks besides colour, so no chart relies on colour alone (WCAG 2.2, 1.4.1). */
export const CANDIDATE_SYMBOLS = ['circle', 'rect', 'triangle', 'diamond', 'pin', 'arrow', 'roundRect', 'circle'];

export function candidateSymbol(index: number): string {
  const n = CANDIDATE_SYMBOLS.length;
  return CANDIDATE_SYMBOLS[((index % n) + n) % n];
}

/** Estimates (candidate colours belong to candidates): greys and two muted hues. */
export const ESTIMATE_COLOURS = [INK, INK_FAINT, '#A39C8F', '#3F6E73', '#8C6B3E'] as const;

/** Negative to positive correlation. */
export const DIVERGING = ['#2166AC', '#67A9CF', '#D1E5F0', '#F7F7F7', '#FDDBC7', '#EF8A62', '#B2182B'];

/** The screens' font stack (the memo embeds Source Sans 3 itself). */
export const FONT = "'Source Sans 3', 'Segoe UI', 'Noto Sans', 'DejaVu Sans', Helvetica, Arial, sans-serif";
