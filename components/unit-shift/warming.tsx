import { Controller, useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { problemOf } from '@/components/api/client';
import { clockTime, minutesWords } from '@/components/board/board-format';
import { Button } from '@/components/ui/button';
import type { ClockSetting } from '@/components/ui/format-time';
import { Segmented } from '@/components/ui/segmented';
import { StatusBadge } from '@/components/ui/status-badge';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import type { BedWarming } from '@/shared/schemas/warming';
import { formatTemperature, fromCentiCelsius, type TempUnit } from '@/shared/thermal/units';
import { CONTROL_MODE_LABELS, CONTROL_MODES, HEAT_SOURCE_LABELS, HEAT_SOURCES } from '@/shared/vocabulary';
import { useStartWarmingMutation, useStopWarmingMutation } from './queries';

/** The admit form's heat source, mode and set temperature, taken from the bed's warming. */
export function admitDefaultsFromWarming(
  w: BedWarming | undefined,
  tempUnit: TempUnit,
): { heatSource: BedWarming['heatSource']; controlMode: BedWarming['controlMode']; setTemperature: string } | null {
  return w ? { heatSource: w.heatSource, controlMode: w.controlMode, setTemperature: fromCentiCelsius(w.setCenti, tempUnit).toFixed(1) } : null;
}

/** What an empty tile shows while its bed is warmed: since when, the settings, whom it is for. */
export function WarmingLine({ warming, tempUnit, timeZone, clock, nowMs }: { warming: BedWarming; tempUnit: TempUnit; timeZone: string; clock: ClockSetting; nowMs: number }) {
  // How long, in words: "under 1 min" at first, "1 h 05 min" later (never "0 min" or "65 min").
  const seconds = (nowMs - Date.parse(warming.since)) / 1000;
  const howLong = seconds < 60 ? 'under 1 min' : minutesWords(seconds);
  const forWhom = warming.expectedInfant ? ` · for ${warming.expectedInfant}` : '';
  return (
    <View style={styles.line}>
      <StatusBadge tone="warning" icon="thermometer" label={`Warming for an admission, ${howLong}`} large />
      <Text variant="label">
        Since {clockTime(warming.since, timeZone, clock)} · {HEAT_SOURCE_LABELS[warming.heatSource]}, {CONTROL_MODE_LABELS[warming.controlMode].toLowerCase()}, set{' '}
        {formatTemperature(warming.setCenti, tempUnit)}
        {forWhom}
      </Text>
    </View>
  );
}

interface WarmingFormValues {
  heatSource: BedWarming['heatSource'];
  controlMode: BedWarming['controlMode'];
  setTemperature: string;
  sinceTime: string;
  expectedInfant: string;
}

/** "HH:MM" today (or yesterday, when that is still to come) as an instant; empty means now. */
function sinceInstant(hhmm: string): string | undefined {
  const m = /^([01]\d|2[0-3]):([0-5]\d)$/.exec(hhmm.trim());
  if (!m) return hhmm.trim() ? hhmm : undefined;
  const at = new Date();
  at.setHours(Number(m[1]), Number(m[2]), 0, 0);
  if (at.getTime() > Date.now() + 5 * 60_000) at.setDate(at.getDate() - 1);
  return at.toISOString();
}

/** The charge nurse marks this empty bed as warming for the next admission, or stops it. */
export function WarmingForm({
  unitId,
  bedId,
  bedLabel,
  warming,
  tempUnit,
  onDone,
}: {
  unitId: string;
  bedId: string;
  bedLabel: string;
  warming: BedWarming | undefined;
  tempUnit: TempUnit;
  onDone: () => void;
}) {
  const start = useStartWarmingMutation(unitId, bedId);
  const stop = useStopWarmingMutation(unitId, bedId);
  const { control, handleSubmit } = useForm<WarmingFormValues>({
    defaultValues: {
      heatSource: warming?.heatSource ?? 'incubator',
      controlMode: warming?.controlMode ?? 'air-servo',
      setTemperature: warming ? fromCentiCelsius(warming.setCenti, tempUnit).toFixed(1) : '',
      sinceTime: '',
      expectedInfant: warming?.expectedInfant ?? '',
    },
  });
  const problem = start.error ? problemOf(start.error) : stop.error ? problemOf(stop.error) : null;
  const fields = problem && 'fields' in problem ? (problem.fields ?? {}) : {};
  const submit = handleSubmit((v) =>
    start.mutate(
      {
        heatSource: v.heatSource,
        controlMode: v.controlMode,
        setTemperature: Number(v.setTemperature.replace(',', '.')),
        tempUnit,
        since: sinceInstant(v.sinceTime),
        expectedInfant: v.expectedInfant.trim() || undefined,
      },
      { onSuccess: onDone },
    ),
  );
  return (
    <View style={styles.form} role="group" aria-label={`Warm bed ${bedLabel} for an admission`}>
      <Text tone="muted">Warm the bed before the infant arrives. Follow the device’s instructions and unit policy for pre-warming.</Text>
      <Controller
        control={control}
        name="heatSource"
        render={({ field }) => (
          <Segmented label="Heat source" value={field.value} onChange={field.onChange} options={HEAT_SOURCES.map((v) => ({ value: v, label: HEAT_SOURCE_LABELS[v] }))} />
        )}
      />
      <Controller
        control={control}
        name="controlMode"
        render={({ field }) => (
          <Segmented label="Control mode" value={field.value} onChange={field.onChange} options={CONTROL_MODES.map((v) => ({ value: v, label: CONTROL_MODE_LABELS[v] }))} />
        )}
      />
      <TextField control={control} name="setTemperature" label="Set temperature" suffix={`°${tempUnit}`} keyboardType="decimal-pad" serverError={fields.setTemperature} />
      <TextField control={control} name="sinceTime" label="Warming since" hint="HH:MM, 24-hour; leave empty for now." serverError={fields.since} />
      <TextField
        control={control}
        name="expectedInfant"
        label="Expected infant"
        hint="A name or a short note, for example Twin 1 from delivery suite."
        serverError={fields.expectedInfant}
      />
      {problem ? (
        <Text tone="danger" role="alert">
          {problem.message}
        </Text>
      ) : null}
      <View style={styles.buttons}>
        <Button label={warming ? 'Save the warming' : `Warm ${bedLabel}`} icon="check" busy={start.isPending} onPress={() => void submit()} />
        {warming ? <Button label="Stop warming" variant="secondary" busy={stop.isPending} onPress={() => stop.mutate(undefined, { onSuccess: onDone })} /> : null}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  line: { gap: 6 },
  form: { gap: 12 },
  buttons: { flexDirection: 'row', flexWrap: 'wrap', gap: 8 },
});
