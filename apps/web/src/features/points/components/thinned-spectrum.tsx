/** A capture whose spectra retention thinned away: what the spectrum view shows instead. */
import { Button } from '../../../components/ui/button.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { type ApiError, isApiError } from '../../../lib/api-client.ts';
import { formatDateTime } from '../../../lib/format.ts';

/** The nearest capture with its spectra, as a 410 `spectrum_thinned` names it. */
interface ThinnedDetails {
  nearest: { analysisId: number; takenAt: string } | null;
}

export function thinnedSpectrum(error: unknown): boolean {
  return isApiError(error) && error.code === 'spectrum_thinned';
}

/** A capture whose spectra retention thinned away: say so and offer the nearest whole one. */
export function ThinnedSpectrum({
  error,
  onOpen,
}: {
  error: ApiError;
  onOpen: (id: number) => void;
}) {
  const nearest = (error.details as ThinnedDetails | undefined)?.nearest ?? null;
  return (
    <div role="status">
      <EmptyState
        title="Spectrum no longer stored"
        description={
          <>
            Older captures keep their spectra only at a reduced rate (retention policy); this one
            keeps its overall and band values in the trend.
            {nearest
              ? ` The nearest capture of this point with its spectrum was taken ${formatDateTime(nearest.takenAt)}.`
              : ' No capture of this point still has its spectrum.'}
          </>
        }
        action={
          nearest ? (
            <Button onClick={() => onOpen(nearest.analysisId)}>
              Open the capture of {formatDateTime(nearest.takenAt)}
            </Button>
          ) : undefined
        }
      />
    </div>
  );
}
