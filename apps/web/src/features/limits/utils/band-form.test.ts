import { describe, expect, it } from 'vitest';
import type { BandDefinitionInput } from '@turnstone/contracts/limits';
import { NEW_BAND_RULES } from '@turnstone/condition/band-definition';
import { bpfoEnvelope, overallVelocity } from '@turnstone/condition/test-bands';
import { checkForm, emptyBand, formPathOf, toDefinition, toFormBand } from './band-form.ts';

// Band shapes follow @turnstone/condition's BandDefinition (Turnstone's own rules, no source).
const overall: BandDefinitionInput = {
  ...overallVelocity(2.8, 4.5),
  name: 'Overall velocity 10–1000 Hz',
  fromHz: 10,
  toHz: 1000,
  ...NEW_BAND_RULES,
  levelSource: 'ISO 20816-3 B/C and C/D',
};
const bpfo: BandDefinitionInput = {
  ...bpfoEnvelope(0.2, 0.5),
  harmonics: 1,
  statistical: {
    kAlert: 3,
    kDanger: 6,
    baseline: { from: 'first-n', count: 20 },
    established: { count: 20, mean: 0.05, sigma: 0.01 },
    combine: 'min',
  },
};

describe('band form', () => {
  it('a stored band survives the trip through the form unchanged', () => {
    for (const band of [overall, bpfo]) {
      expect(toDefinition(toFormBand(band), band)).toEqual(band);
    }
  });

  // 1 in = 25.4 mm exactly (NIST SP 811 appendix B): 2.8 mm/s = 0.110236… in/s, shown to
  // four significant digits as 0.1102; 4.5 mm/s = 0.177165… in/s shown as 0.1772 (by hand).
  // A level typed as 0.3 in/s is stored as 7.62 mm/s (0.3 × 25.4, by hand) and shows again as 0.3.
  it('when the user reads imperial, levels are typed in in/s and stored in mm/s, both ways exact', () => {
    const f = toFormBand(overall, 'imperial');
    expect(f.alertLevel).toBe(0.1102);
    expect(f.dangerLevel).toBe(0.1772);
    // Untouched fields give the stored levels back exactly, not 0.1102 × 25.4 = 2.79908.
    expect(toDefinition(f, overall, 'imperial')).toEqual(overall);
    const typed = { ...f, alertLevel: 0.3, dangerLevel: 0.45 };
    const d = toDefinition(typed, overall, 'imperial') as BandDefinitionInput;
    expect(d.alertLevel).toBe(7.62);
    expect(d.dangerLevel).toBe(11.43);
    expect(toFormBand(d, 'imperial').alertLevel).toBe(0.3);
    // g stays g in both systems.
    expect(toDefinition(toFormBand(bpfo, 'imperial'), bpfo, 'imperial')).toEqual(bpfo);
  });

  it('when only the danger level is edited in imperial, the untouched alert level keeps its stored value', () => {
    const f = { ...toFormBand(overall, 'imperial'), dangerLevel: 0.2 };
    const d = toDefinition(f, overall, 'imperial') as BandDefinitionInput;
    expect(d.alertLevel).toBe(2.8);
    expect(d.dangerLevel).toBe(5.08); // 0.2 × 25.4 (by hand)
    // Typed back to what it showed: the stored level again, not 0.1772 × 25.4 = 4.50088.
    const back = { ...toFormBand(overall, 'imperial'), dangerLevel: 0.1772 };
    expect((toDefinition(back, overall, 'imperial') as BandDefinitionInput).dangerLevel).toBe(4.5);
    // A value typed anew that differs from the shown one in the last digit converts.
    const near = { ...toFormBand(overall, 'imperial'), dangerLevel: 0.1771 };
    expect((toDefinition(near, overall, 'imperial') as BandDefinitionInput).dangerLevel).toBe(
      4.49834, // 0.1771 × 25.4 (by hand)
    );
  });

  it('in metric, levels show exactly as stored', () => {
    const f = toFormBand({ ...overall, alertLevel: 2.81234567 }, 'metric');
    expect(f.alertLevel).toBe(2.81234567);
  });

  it('an established baseline is dropped when the baseline count changes', () => {
    const f = { ...toFormBand(bpfo), baselineCount: 30 };
    const d = toDefinition(f, bpfo) as BandDefinitionInput;
    expect(d.statistical?.baseline).toEqual({ from: 'first-n', count: 30 });
    expect(d.statistical?.established).toBeUndefined();
  });

  it('danger at or below alert is refused on the danger field', () => {
    const f = { ...toFormBand(overall), dangerLevel: 2.8 };
    const out = checkForm({ bands: [f] }, [overall]);
    expect(out).toEqual({
      ok: false,
      errors: [
        { path: 'bands.0.dangerLevel', message: 'The danger level must be above the alert level.' },
      ],
    });
  });

  it('an empty required number reads "Enter a number." on its field', () => {
    const f = { ...emptyBand(0), toHz: Number.NaN };
    const out = checkForm({ bands: [f] }, []);
    expect(out.ok).toBe(false);
    if (!out.ok)
      expect(out.errors).toContainEqual({ path: 'bands.0.toHz', message: 'Enter a number.' });
  });

  it('two bands with one key are refused', () => {
    const out = checkForm({ bands: [toFormBand(overall), toFormBand(overall)] }, [overall]);
    expect(out.ok).toBe(false);
    if (!out.ok) expect(out.errors.map((e) => e.path)).toEqual(['bands.1.key']);
  });

  it("maps the server's field paths onto the form's", () => {
    expect(formPathOf('bands.2.dangerLevel')).toBe('bands.2.dangerLevel');
    expect(formPathOf('bands.1.statistical.baseline.count')).toBe('bands.1.baselineCount');
    expect(formPathOf('bands.0.statistical.kAlert')).toBe('bands.0.kAlert');
    expect(formPathOf('reason')).toBe('root');
  });
});
