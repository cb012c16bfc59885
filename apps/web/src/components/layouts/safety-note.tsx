/**
 * The caution every page carries; signed in, also the time zone the page's times are in (the
 * user's sites' zone, or UTC when their sites span several; a page of one site says its own).
 */
export function SafetyNote({ timeZone }: { timeZone?: string }) {
  return (
    <footer className="border-t border-line px-4 py-2.5 text-center text-xs text-ink-muted sm:px-6">
      Turnstone is not a machine-protection system. Limits and alerts are guidance; follow site
      lock-out procedures.
      {timeZone && (
        <span data-testid="time-zone-note">
          {' '}
          Times are in {timeZone} unless a page names a site’s own.
        </span>
      )}
    </footer>
  );
}
