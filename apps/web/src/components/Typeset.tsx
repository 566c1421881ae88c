// Orbital names, units and exponents in the UI: the one typesetter of @psiform/print turned into <sub>/<sup>.
import { typeset } from '@psiform/print';

/** Renders `text` ('3d_z²', '2p(m=+1)', 'a0^−3/2') with real sub- and superscripts. */
export function Typeset({ text, className }: { text: string; className?: string }) {
  const runs = typeset(text);
  return (
    <span className={className ? `pf-typeset ${className}` : 'pf-typeset'}>
      {runs.map((r, i) => (r.script === 'sub' ? <sub key={i}>{r.text}</sub> : r.script === 'sup' ? <sup key={i}>{r.text}</sup> : <span key={i}>{r.text}</span>))}
    </span>
  );
}
