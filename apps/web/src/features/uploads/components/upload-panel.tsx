import { uploadFieldsSchema } from '@turnstone/contracts/uploads';
import { wallTimeInstant } from '@turnstone/contracts/dates';
import { useQueryClient } from '@tanstack/react-query';
import { useRef, useState, type DragEvent } from 'react';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import {
  Field,
  InputField,
  NumberField,
  Select,
  SelectField,
  type SelectOption,
} from '../../../components/ui/field.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { cn } from '../../../lib/cn.ts';
import { useUploadPoints } from '../api/get-upload-points.ts';
import { uploadRecording } from '../api/upload-recording.ts';
import { UploadRow, type UploadItem } from './upload-row.tsx';

type Settings = {
  sensitivityMvPerG: string;
  fullScaleV: string;
  bits: string;
  speedRpm: string;
  sampleRateHz: string;
  unit: 'g' | 'volts';
  takenAt: string;
};
const emptySettings: Settings = {
  sensitivityMvPerG: '',
  fullScaleV: '',
  bits: '',
  speedRpm: '',
  sampleRateHz: '',
  unit: 'g',
  takenAt: '',
};

/** `datetime-local` text, read in the site's zone → the ISO instant the API wants. */
function isoFromLocal(value: string, timeZone: string): string {
  if (!value) return '';
  const ms = wallTimeInstant(value, timeZone);
  return ms === null ? value : new Date(ms).toISOString();
}

let nextKey = 0;

const csvUnitOptions: SelectOption[] = [
  ['g', 'g (acceleration)'],
  ['volts', 'volts (sensor output)'],
];

export function UploadPanel() {
  const points = useUploadPoints();
  const queryClient = useQueryClient();
  const [pointId, setPointId] = useState<number | null>(null);
  const [settings, setSettings] = useState<Settings>(emptySettings);
  const [errors, setErrors] = useState<Partial<Record<keyof Settings | 'point', string>>>({});
  const [items, setItems] = useState<UploadItem[]>([]);
  const [dragging, setDragging] = useState(false);
  const [sending, setSending] = useState(false);
  const fileInput = useRef<HTMLInputElement>(null);

  if (points.isPending) return <LoadingPanel />;
  if (points.isError)
    return (
      <Card>
        <ErrorState
          error={points.error}
          onRetry={() => void points.refetch()}
          retrying={points.isFetching}
        />
      </Card>
    );
  if (points.data.length === 0)
    return (
      <Card>
        <EmptyState
          title="No points to upload to"
          description="Set up a machine with a measurement point first."
        />
      </Card>
    );

  const groups = [...new Set(points.data.map((p) => p.group))];
  // A setting's field: its text, its change and its error.
  const setting = (k: keyof Settings) => ({
    value: settings[k],
    onChange: (e: { target: { value: string } }) =>
      setSettings((s) => ({ ...s, [k]: e.target.value })),
    error: errors[k],
  });
  // The number settings are compact, two to a row.
  const numberSetting = (k: keyof Settings) => ({ ...setting(k), controlSize: 'sm' as const });
  const update = (key: string, patch: Partial<UploadItem>) =>
    setItems((list) => list.map((it) => (it.key === key ? { ...it, ...patch } : it)));

  const addFiles = (list: FileList | null) => {
    // Copy now: the FileList empties when the input is reset right after this call.
    const files = list ? [...list] : [];
    if (files.length === 0) return;
    if (pointId === null) {
      setErrors((e) => ({ ...e, point: 'Choose the point these recordings were taken at.' }));
      return;
    }
    const tag = points.data.find((p) => p.id === pointId)?.tag ?? '';
    setItems((list) => [
      ...list,
      ...files.map((file) => ({
        key: `f${nextKey++}`,
        file,
        pointId,
        pointTag: tag,
        state: 'ready' as const,
        progress: 0,
      })),
    ]);
  };

  const zone = points.data.find((p) => p.id === pointId)?.timeZone ?? 'UTC';
  const fields = { ...settings, takenAt: isoFromLocal(settings.takenAt, zone) };
  const sendAll = async () => {
    const parsed = uploadFieldsSchema.safeParse(fields);
    if (!parsed.success) {
      const next: typeof errors = {};
      for (const issue of parsed.error.issues) {
        const k = issue.path[0] as keyof Settings;
        next[k] ??= issue.message;
      }
      setErrors(next);
      return;
    }
    setErrors({});
    setSending(true);
    // One at a time: each bar moves in turn and the server is not flooded.
    for (const item of items.filter((i) => i.state === 'ready')) {
      update(item.key, { state: 'uploading', progress: 0 });
      try {
        const r = await uploadRecording(item.pointId, item.file, fields, (progress) =>
          update(item.key, { progress }),
        );
        update(item.key, {
          state: 'sent',
          progress: 1,
          snapshotId: r.snapshotId,
          repeated: r.status === 'already-uploaded',
        });
      } catch (e) {
        update(item.key, {
          state: 'refused',
          error: e instanceof Error ? e.message : 'Upload failed.',
        });
      }
    }
    setSending(false);
    void queryClient.invalidateQueries({ queryKey: ['fleet'] });
  };

  const onDrop = (e: DragEvent) => {
    e.preventDefault();
    setDragging(false);
    addFiles(e.dataTransfer.files);
  };
  const ready = items.filter((i) => i.state === 'ready').length;

  return (
    <div className="grid gap-4 lg:grid-cols-[minmax(20rem,26rem)_1fr]">
      <Card className="flex flex-col gap-4 p-5">
        <h2 className="text-sm font-semibold">Point and capture settings</h2>
        <Field label="Point" error={errors.point}>
          {({ invalid: _i, ...ids }) => (
            <Select
              {...ids}
              value={pointId ?? ''}
              onChange={(e) => {
                setPointId(e.target.value ? Number(e.target.value) : null);
                setErrors((x) => ({ ...x, point: undefined }));
              }}
            >
              <option value="">Choose a point…</option>
              {groups.map((g) => (
                <optgroup key={g} label={g}>
                  {points.data
                    .filter((p) => p.group === g)
                    .map((p) => (
                      <option key={p.id} value={p.id}>
                        {p.label}
                      </option>
                    ))}
                </optgroup>
              ))}
            </Select>
          )}
        </Field>
        <div className="grid grid-cols-2 gap-3">
          <NumberField
            label="Sensitivity"
            unit="mV/g"
            hint="Empty: the point's."
            {...numberSetting('sensitivityMvPerG')}
          />
          <NumberField
            label="Full scale"
            unit="V"
            hint="WAV default 1 V, CSV 10 V."
            {...numberSetting('fullScaleV')}
          />
          <NumberField
            label="ADC bits"
            unit="bit"
            hint="Empty: from the file."
            step="1"
            {...numberSetting('bits')}
          />
          <NumberField
            label="Speed"
            unit="r/min"
            hint="Empty: estimated."
            {...numberSetting('speedRpm')}
          />
          <NumberField
            label="Sample rate"
            unit="Hz"
            hint="For CSV without a time column."
            {...numberSetting('sampleRateHz')}
          />
          <SelectField label="CSV values in" options={csvUnitOptions} {...setting('unit')} />
        </div>
        <InputField
          label="Taken at"
          hint={`In ${zone}, the point's site's time. Empty: the time of upload.`}
          type="datetime-local"
          {...setting('takenAt')}
        />
      </Card>

      <div className="flex min-w-0 flex-col gap-4">
        <div
          onDragOver={(e) => {
            e.preventDefault();
            setDragging(true);
          }}
          onDragLeave={() => setDragging(false)}
          onDrop={onDrop}
          className={cn(
            'flex flex-col items-center justify-center gap-2 rounded-lg border-2 border-dashed px-6 py-10 text-center',
            dragging ? 'border-accent bg-accent-soft' : 'border-line-strong bg-surface',
          )}
        >
          <p className="text-sm font-medium">Drop WAV or CSV recordings here</p>
          <p className="text-xs text-ink-muted">
            PCM 16/24/32-bit or float WAV; CSV with one column (value) or two (time in s, value). Up
            to 32 MiB each.
          </p>
          <Button size="sm" onClick={() => fileInput.current?.click()}>
            Choose files…
          </Button>
          <input
            ref={fileInput}
            type="file"
            multiple
            accept=".wav,.csv,audio/wav,text/csv"
            className="sr-only"
            aria-label="Recordings to upload"
            onChange={(e) => {
              addFiles(e.target.files);
              e.target.value = '';
            }}
          />
          {errors.point && <p className="text-xs font-medium text-status-danger">{errors.point}</p>}
        </div>

        {items.length > 0 && (
          <Card>
            <div className="flex items-center justify-between gap-3 border-b border-line px-4 py-2.5">
              <h2 className="text-sm font-semibold">Files</h2>
              <Button
                variant="primary"
                size="sm"
                disabled={ready === 0}
                busy={sending}
                onClick={() => void sendAll()}
              >
                {ready > 0 ? `Upload ${ready} file${ready === 1 ? '' : 's'}` : 'Upload files'}
              </Button>
            </div>
            <ul>
              {items.map((item) => (
                <UploadRow
                  key={item.key}
                  item={item}
                  onRemove={() => setItems((l) => l.filter((i) => i.key !== item.key))}
                />
              ))}
            </ul>
          </Card>
        )}
      </div>
    </div>
  );
}
