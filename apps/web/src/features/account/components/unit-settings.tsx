import { unitSystemLabels, type UnitSystem } from '@turnstone/contracts/units';
import { Card } from '../../../components/ui/card.tsx';
import { Segmented } from '../../../components/ui/segmented.tsx';
import { useSavePreferences } from '../api/account.ts';
import { useUnits } from '../api/use-units.ts';

const options = (['metric', 'imperial'] as const).map((value) => ({
  value,
  label: unitSystemLabels[value],
}));

/** The user's unit system: every screen, CSV export and their alert e-mails follow it. */
export function UnitSettings() {
  const { system } = useUnits();
  const save = useSavePreferences();
  return (
    <Card className="p-4">
      <h2 className="text-sm font-semibold">Units</h2>
      <p className="mt-0.5 mb-3 text-sm text-ink-muted">
        How velocity and displacement are shown to you on screens, in CSV exports and in your
        e-mails. Acceleration stays in g; values are stored in metric either way (1 in = 25.4 mm).
      </p>
      <Segmented<UnitSystem>
        label="Unit system"
        options={options}
        value={save.isPending && save.variables ? save.variables.unitSystem : system}
        disabled={save.isPending}
        onChange={(unitSystem) => {
          if (unitSystem !== system) save.mutate({ unitSystem });
        }}
      />
      {save.isError && (
        <p role="alert" className="mt-2 text-sm text-danger">
          The unit system was not saved: {save.error.message}
        </p>
      )}
    </Card>
  );
}
