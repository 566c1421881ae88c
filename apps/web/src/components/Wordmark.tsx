/** The product name set in type, with a small two-lobed mark (one lobe filled, one open: the two phases). */
export function Wordmark({ large = false }: { large?: boolean }) {
  return (
    <span className={large ? 'pf-wordmark pf-wordmark-large' : 'pf-wordmark'}>
      <svg className="pf-mark" viewBox="0 0 16 24" aria-hidden="true" focusable="false">
        <ellipse cx="8" cy="6.5" rx="4" ry="5.5" className="pf-mark-fill" />
        <ellipse cx="8" cy="17.5" rx="3.4" ry="4.9" className="pf-mark-open" />
      </svg>
      <span className="pf-wordmark-text">Psiform</span>
    </span>
  );
}
