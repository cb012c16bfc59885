import { WEEKS_AHEAD_CHOICES } from '@turnstone/contracts/review';
import { useId } from 'react';
import { Button } from '../../../components/ui/button.tsx';
import { Input, Select } from '../../../components/ui/field.tsx';
import { useSites } from '../api/get-sites.ts';
import type { ReviewParams } from '../api/get-review.ts';
import { addDays, isIsoDate } from '../utils/format-review.ts';

/** Week, site and forecast horizon of the review. Hidden on paper. */
export function ReviewToolbar({
  params,
  onChange,
}: {
  params: ReviewParams;
  onChange: (next: ReviewParams) => void;
}) {
  const sites = useSites();
  const id = useId();
  const items = sites.data?.items ?? [];
  return (
    <div
      data-print="hide"
      className="flex flex-wrap items-end gap-x-5 gap-y-3 rounded-lg border border-line bg-surface px-4 py-3"
    >
      <div className="flex flex-col gap-1.5">
        <label htmlFor={`${id}-week`} className="text-sm font-medium text-ink">
          Week ending
        </label>
        <div className="flex items-center gap-1">
          <Button
            size="sm"
            variant="ghost"
            aria-label="Previous week"
            onClick={() => onChange({ ...params, weekEnding: addDays(params.weekEnding, -7) })}
          >
            ‹
          </Button>
          <Input
            id={`${id}-week`}
            type="date"
            controlSize="sm"
            className="w-40 font-mono"
            value={params.weekEnding}
            onChange={(e) => {
              if (isIsoDate(e.target.value)) onChange({ ...params, weekEnding: e.target.value });
            }}
          />
          <Button
            size="sm"
            variant="ghost"
            aria-label="Next week"
            onClick={() => onChange({ ...params, weekEnding: addDays(params.weekEnding, 7) })}
          >
            ›
          </Button>
        </div>
      </div>
      <div className="flex flex-col gap-1.5">
        <label htmlFor={`${id}-site`} className="text-sm font-medium text-ink">
          Site
        </label>
        <Select
          id={`${id}-site`}
          className="w-64"
          value={params.siteId === undefined ? '' : String(params.siteId)}
          onChange={(e) =>
            onChange({
              ...params,
              siteId: e.target.value === '' ? undefined : Number(e.target.value),
            })
          }
        >
          <option value="">All my sites</option>
          {items.map((s) => (
            <option key={s.id} value={s.id}>
              {s.code} · {s.name}
            </option>
          ))}
        </Select>
      </div>
      <div className="flex flex-col gap-1.5">
        <label htmlFor={`${id}-ahead`} className="text-sm font-medium text-ink">
          Forecast horizon
        </label>
        <Select
          id={`${id}-ahead`}
          className="w-36"
          value={String(params.weeksAhead)}
          onChange={(e) => onChange({ ...params, weeksAhead: Number(e.target.value) })}
        >
          {WEEKS_AHEAD_CHOICES.map((n) => (
            <option key={n} value={n}>
              {n} weeks
            </option>
          ))}
        </Select>
      </div>
    </div>
  );
}
