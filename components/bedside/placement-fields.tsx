import { useWatch, type Control, type UseFormSetValue } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { axillaProbeNote, PLACEMENT_SOURCES, placementPrompt, placementPromptWords, type PlacementPromptCode } from '@/shared/thermal/placement';
import { INFANT_POSITION_LABELS, INFANT_POSITIONS, PROBE_SITE_LABELS, PROBE_SITES, type InfantPosition, type ProbeSite } from '@/shared/vocabulary';
import { useTheme } from '@/components/theme/theme-provider';
import { Card } from '@/components/ui/card';
import { Segmented } from '@/components/ui/segmented';
import { StatusBadge } from '@/components/ui/status-badge';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import type { PlacementFormValues } from './placement-values';
import type { ReadingFormValues } from './reading-form-values';

/**
 * The probe's place on the forms: where the probe sits, whether it is under a heat-reflecting
 * cover, how the infant lies. Shown as settings (the current ones chosen already); the prompt for
 * a probe on the abdomen of a prone infant and the note for a probe on the axilla come from
 * shared/thermal/placement.ts, before saving.
 */

const SITE_OPTIONS = PROBE_SITES.map((value) => ({ value, label: PROBE_SITE_LABELS[value] }));
const POSITION_OPTIONS = INFANT_POSITIONS.map((value) => ({ value, label: INFANT_POSITION_LABELS[value] }));
const COVER_OPTIONS = [
  { value: 'yes' as const, label: 'Covered' },
  { value: 'no' as const, label: 'Not covered' },
];

export interface PlacementChoice {
  probeSite: ProbeSite | null;
  probeCovered: 'yes' | 'no' | null;
  position: InfantPosition | null;
}

/** The three choices, for any form (the reading form, the admission, a change of placement). */
export function PlacementChoices({ value, onChange }: { value: PlacementChoice; onChange: (next: PlacementChoice) => void }) {
  return (
    <View style={styles.group} role="group" aria-label="Probe placement">
      <Segmented label="Probe site" value={value.probeSite} options={SITE_OPTIONS} onChange={(probeSite) => onChange({ ...value, probeSite })} />
      <Segmented
        label="Heat-reflecting cover over the probe"
        value={value.probeCovered}
        options={COVER_OPTIONS}
        onChange={(probeCovered) => onChange({ ...value, probeCovered })}
      />
      <Segmented label="Infant's position" value={value.position} options={POSITION_OPTIONS} onChange={(position) => onChange({ ...value, position })} />
    </View>
  );
}

/** The prompt for a placement (or null): the words, what to do, and where it comes from. */
export function PlacementPromptNote({ code }: { code: PlacementPromptCode | null | undefined }) {
  const theme = useTheme();
  const text = placementPromptWords(code);
  if (!code || !text) return null;
  return (
    <Card style={{ borderColor: theme.colors.warning, backgroundColor: theme.colors.warningSoft }} role="alert" aria-label="Probe placement prompt">
      <StatusBadge tone="warning" icon="alert" label="Move the probe" />
      <Text>{text}</Text>
      <Text variant="caption" tone="muted">
        Source: {PLACEMENT_SOURCES[code]}.
      </Text>
    </Card>
  );
}

/** The axilla note, when the probe is on the axilla. */
export function AxillaProbeNote({ probeSite }: { probeSite: ProbeSite | null | undefined }) {
  const note = axillaProbeNote(probeSite);
  if (!note) return null;
  return (
    <View role="status" style={styles.note}>
      <StatusBadge tone="neutral" icon="thermometer" label="Probe on the axilla" />
      <Text variant="caption">{note} (Common practice.)</Text>
    </View>
  );
}

/** The reading form's placement settings, bound to its values. */
export function ReadingPlacementSettings({ control, setValue }: { control: Control<ReadingFormValues>; setValue: UseFormSetValue<ReadingFormValues> }) {
  const [probeSite, probeCovered, position] = useWatch({ control, name: ['probeSite', 'probeCovered', 'position'] });
  return (
    <PlacementChoices
      value={{ probeSite: probeSite ?? null, probeCovered: probeCovered ?? null, position: position ?? null }}
      onChange={(next) => {
        if (next.probeSite !== (probeSite ?? null)) setValue('probeSite', next.probeSite, { shouldDirty: true });
        if (next.probeCovered !== (probeCovered ?? null)) setValue('probeCovered', next.probeCovered, { shouldDirty: true });
        if (next.position !== (position ?? null)) setValue('position', next.position, { shouldDirty: true });
      }}
    />
  );
}

/** What the placement as chosen on the reading form says, before saving. */
export function ReadingPlacementPrompt({ control }: { control: Control<ReadingFormValues> }) {
  const [probeSite, position] = useWatch({ control, name: ['probeSite', 'position'] });
  return (
    <>
      <PlacementPromptNote code={placementPrompt({ probeSite: probeSite ?? null, position: position ?? null })} />
      <AxillaProbeNote probeSite={probeSite} />
    </>
  );
}

/**
 * Current weight and incubator humidity: optional measurements, never prefilled. Each on its own
 * row on a phone, side by side where both fit at a usable width (the reading form is 560 px at most).
 */
export function WeightHumidityFields({ control, serverFields = {} }: { control: Control<ReadingFormValues>; serverFields?: Record<string, string> }) {
  return (
    <View style={styles.row}>
      <View style={styles.cell}>
        <TextField
          control={control}
          name="weight"
          label="Current weight (g)"
          suffix="g"
          inputMode="numeric"
          keyboardType="number-pad"
          serverError={serverFields.weightGrams}
          style={styles.input}
        />
      </View>
      <View style={styles.cell}>
        <TextField
          control={control}
          name="humidity"
          label="Incubator humidity (%)"
          suffix="%"
          inputMode="numeric"
          keyboardType="number-pad"
          serverError={serverFields.humidityPct}
          style={styles.input}
        />
      </View>
    </View>
  );
}

export type { PlacementFormValues };

const styles = StyleSheet.create({
  group: { gap: 10 },
  note: { gap: 4 },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: 12 },
  // Two cells of 240 and the gap need 492 px: they wrap below that (a phone), and each may
  // shrink below its input's own width (a browser's input is about 180 px wide unless told otherwise).
  cell: { flexGrow: 1, flexShrink: 1, flexBasis: 240, minWidth: 0 },
  input: { minWidth: 0 },
});
