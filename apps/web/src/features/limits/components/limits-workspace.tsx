import { useEffect, useRef, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { Card } from '../../../components/ui/card.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { Field, Select } from '../../../components/ui/field.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { TabList, TabPanel } from '../../../components/ui/tabs.tsx';
import { cn } from '../../../lib/cn.ts';
import { useLimitTemplate } from '../api/get-limits.ts';
import { useLimits } from '../api/get-limit-set.ts';
import { LimitsEditor } from './limits-editor.tsx';
import { PointPicker } from './point-picker.tsx';

const editTabs = [
  { key: 'point', label: 'A point' },
  { key: 'template', label: 'A machine-type template' },
] as const;

const machineTypes = ['motor', 'pump', 'fan', 'blower', 'gearbox', 'compressor'] as const;

/**
 * The outcome of a save: a live region always in the page (so it is announced), and the
 * focus goes to it, since the editor that held the focus is remounted with the new version.
 */
function SavedNote({ text }: { text: string | null }) {
  const note = useRef<HTMLParagraphElement>(null);
  useEffect(() => {
    if (text) note.current?.focus();
  }, [text]);
  return (
    <div role="status">
      {text && (
        <p
          ref={note}
          tabIndex={-1}
          className="rounded-md border border-line bg-accent-soft px-3 py-2 text-sm text-ink focus-visible:outline-none"
        >
          {text} The change and its reason are in the audit log.
        </p>
      )}
    </div>
  );
}

/**
 * Edit a point's limits (?point=) or a machine-type template (?template=); the choice lives
 * in the URL so a link opens the same editor.
 */
export function LimitsWorkspace() {
  const [params, setParams] = useSearchParams();
  const template = params.get('template');
  const mode: 'point' | 'template' = template ? 'template' : 'point';
  const pointId = Number(params.get('point')) || null;
  const [saved, setSaved] = useState<string | null>(null);
  return (
    <div className="flex flex-col gap-4">
      <TabList
        group="limits"
        label="What to edit"
        tabs={editTabs}
        value={mode}
        onChange={(value) => {
          setSaved(null);
          setParams(value === 'template' ? { template: 'pump' } : {}, { replace: true });
        }}
        className="flex w-fit gap-1 rounded-lg bg-sunken p-1"
        tabClassName={(selected) =>
          cn(
            'rounded-md px-3 py-1.5 text-sm font-medium',
            selected ? 'bg-surface text-ink shadow-sm' : 'text-ink-muted hover:text-ink',
          )
        }
      />
      <TabPanel group="limits" value={mode} className="flex flex-col gap-4">
        {mode === 'point' ? (
          <>
            <PointPicker
              value={pointId}
              onChange={(id) => {
                setSaved(null);
                setParams(id ? { point: String(id) } : {}, { replace: true });
              }}
            />
            {pointId === null ? (
              <Card>
                <EmptyState
                  title="Choose a point"
                  description="Pick a measurement point to see and edit its alarm bands."
                />
              </Card>
            ) : (
              <PointLimits pointId={pointId} saved={saved} onSaved={setSaved} />
            )}
          </>
        ) : (
          <>
            <Field label="Machine type" className="max-w-xs">
              {(c) => (
                <Select
                  id={c.id}
                  value={template ?? 'pump'}
                  onChange={(e) => {
                    setSaved(null);
                    setParams({ template: e.target.value }, { replace: true });
                  }}
                >
                  {machineTypes.map((t) => (
                    <option key={t} value={t}>
                      {t}
                    </option>
                  ))}
                </Select>
              )}
            </Field>
            <TemplateLimits machineType={template ?? 'pump'} saved={saved} onSaved={setSaved} />
          </>
        )}
      </TabPanel>
    </div>
  );
}

function PointLimits({
  pointId,
  saved,
  onSaved,
}: {
  pointId: number;
  saved: string | null;
  onSaved: (m: string) => void;
}) {
  const limits = useLimits(pointId);
  if (limits.isPending) return <LoadingPanel label="Loading the limit set…" />;
  if (limits.isError)
    return (
      <Card>
        <ErrorState
          title="Could not load the limits"
          error={limits.error}
          onRetry={() => void limits.refetch()}
        />
      </Card>
    );
  const d = limits.data;
  return (
    <>
      <p className="text-sm text-ink-muted">
        {d.machine.name} · <span className="font-mono">{d.point.tag}</span> · ISO 20816-3 group{' '}
        {d.machine.isoGroup}, {d.machine.foundation} foundation,{' '}
        <span className="font-mono">{d.machine.nominalRpm} r/min</span>
        {d.version === 0 && ' · not measured yet: these are the template’s bands'}
      </p>
      <SavedNote text={saved} />
      {/* Remount on point or version change so the form starts from the stored set. */}
      <LimitsEditor
        key={`${pointId}-${d.version}`}
        limits={d}
        target={{ kind: 'point', pointId }}
        onSaved={onSaved}
      />
    </>
  );
}

function TemplateLimits({
  machineType,
  saved,
  onSaved,
}: {
  machineType: string;
  saved: string | null;
  onSaved: (m: string) => void;
}) {
  const t = useLimitTemplate(machineType);
  if (t.isPending) return <LoadingPanel label="Loading the template…" />;
  if (t.isError)
    return (
      <Card>
        <ErrorState
          title="Could not load the template"
          error={t.error}
          onRetry={() => void t.refetch()}
        />
      </Card>
    );
  return (
    <>
      <p className="text-sm text-ink-muted">
        {t.data.source === 'stored'
          ? `Stored ${machineType} template, version ${t.data.version}.`
          : `Built-in ${machineType} template, shown for an ISO 20816-3 group 2, rigid, 1480 r/min machine; saving stores it for every new ${machineType} point.`}
      </p>
      <SavedNote text={saved} />
      <LimitsEditor
        key={`${machineType}-${t.data.version}`}
        limits={t.data}
        target={{ kind: 'template', machineType }}
        onSaved={onSaved}
      />
    </>
  );
}
