/** The cautions every screen carries (the README and the memo say the same). */
export const CAUTIONS = [
  'Every figure is an estimate from past data.',
  'Past performance does not guarantee future results.',
  'This is not advice until a licensed adviser has reviewed it under the rules that apply locally.',
] as const;

export function Cautions() {
  return (
    <footer className="cautions" aria-label="Cautions">
      <strong>Before you rely on a figure:</strong> {CAUTIONS.join(' ')}
    </footer>
  );
}
