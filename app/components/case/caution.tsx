/** The caution every results page carries, with the link to the method statement. */
export function ResultsCaution() {
  return (
    <p className="mb-4 rounded border border-line bg-surface px-3 py-2 text-xs text-ink-muted" role="note">
      <strong className="text-ink">Caution.</strong> These results support, and do not replace, the analysis the certifying authority accepts; the
      applicable regulations and licensed practice govern, and the engineer remains responsible for them. The subsonic compressibility rules are valid
      only below each section's critical Mach number. <a href="/methods">Method statement</a>
    </p>
  );
}
