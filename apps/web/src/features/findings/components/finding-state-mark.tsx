import { findingStateLabels, type FindingState } from '@turnstone/contracts/findings';

/** State as shape and text: open (empty ring), planned (half-filled ring), done (tick). */
export function FindingStateMark({ state }: { state: FindingState }) {
  return (
    <span className="inline-flex items-center gap-1.5 text-[13px] whitespace-nowrap text-ink">
      <svg viewBox="0 0 12 12" aria-hidden="true" className="size-3 shrink-0 text-accent">
        {state === 'done' ? (
          <path
            d="M2 6.5 5 9.2 10.2 3"
            fill="none"
            stroke="currentColor"
            strokeWidth="1.8"
            strokeLinecap="round"
            strokeLinejoin="round"
          />
        ) : (
          <>
            <circle cx="6" cy="6" r="4.5" fill="none" stroke="currentColor" strokeWidth="1.4" />
            {state === 'planned' && <path d="M6 1.5a4.5 4.5 0 0 1 0 9Z" fill="currentColor" />}
          </>
        )}
      </svg>
      {findingStateLabels[state]}
    </span>
  );
}
