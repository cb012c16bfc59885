/** The caution every page carries. */
export function SafetyNote() {
  return (
    <footer className="border-t border-line px-4 py-2.5 text-center text-xs text-ink-muted sm:px-6">
      Turnstone is not a machine-protection system. Limits and alerts are guidance; follow site
      lock-out procedures.
    </footer>
  );
}
