/** One stored spectrum as a chart trace on the axis shown, in the amplitude scale shown. */
import { useMemo } from 'react';
import type { SpectrumTrace } from '../../../components/charts/spectrum-chart.tsx';
import { scaleFactor, type AmplitudeScale } from '../../../components/charts/spectrum-math.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { useUnits } from '../../account/api/use-units.ts';
import { useSpectrum } from '../api/get-spectrum.ts';
import { kindFor, type Axis, type Measure } from './spectrum-view.ts';

export function useSpectrumTrace(
  analysisId: number | null,
  measure: Measure,
  axis: Axis,
  role: SpectrumTrace['role'],
  shown: AmplitudeScale | null,
) {
  const q = useSpectrum(analysisId, kindFor(measure, axis));
  const units = useUnits();
  const trace = useMemo((): (SpectrumTrace & { shaftHz: number | null }) | null => {
    const s = q.data;
    if (!s) return null;
    const shaftHz = s.speed.hz;
    let step = s.axis === 'order' ? s.dOrder! : s.dfHz!;
    // Velocity and envelope in orders: the Hz axis divided by the running speed.
    if (axis === 'order' && s.axis === 'hz') {
      if (!shaftHz) return null;
      step = step / shaftHz;
    }
    // Lines in the user's unit system (velocity in in/s for imperial; g stays g), on the scale shown.
    const f = units.value(1, s.unit) * (shown ? scaleFactor(s.scale, shown) : 1);
    const values = f === 1 ? s.decoded : s.decoded.map((v) => v * f);
    return { label: formatDateTime(s.takenAt), values, step, role, shaftHz };
  }, [q.data, axis, role, shown, units]);
  return { query: q, trace };
}
