/** The standing caution: what Switchback's numbers are, and what they are not. */
export function CautionFooter() {
  return (
    <footer className="border-t border-ink/10 bg-paper-sunk">
      <p className="mx-auto max-w-6xl px-6 py-4 text-xs text-ink-soft">
        Switchback&apos;s estimates describe hypothetical choices of a sample, not a clinical assessment of a person; discount
        rates are not a diagnostic test. Studies with real rewards must follow your ethics board&apos;s rules for payments and
        deception.
      </p>
    </footer>
  );
}
