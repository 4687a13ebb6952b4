import { useEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import { useForm, useFormState, useWatch, type Control } from 'react-hook-form';
import { Platform, Pressable, StyleSheet, View, type TextInput } from 'react-native';
import type { CreateReadingInput } from '@/shared/schemas/bedside';
import { BAND_LABELS, temperatureBand } from '@/shared/thermal/bands';
import { assessGapCenti } from '@/shared/thermal/gap';
import { heatStressPrompt, HEAT_STRESS_CHECKLIST, HEAT_STRESS_SIGNS } from '@/shared/thermal/heat-stress';
import type { TempUnit } from '@/shared/thermal/units';
import { TOUCH_TARGET } from '@/components/theme/theme';
import { useTheme } from '@/components/theme/theme-provider';
import { afterNextPaint } from '@/components/ui/after-next-paint';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Caution } from '@/components/ui/caution';
import { Segmented } from '@/components/ui/segmented';
import { StatusBadge } from '@/components/ui/status-badge';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { CONTROL_MODE_LABELS, CONTROL_MODE_OPTIONS, REMOTE_SITE_OPTIONS, SITE_LABELS, tempDelta } from './format';
import { lazyZodResolver } from '@/components/forms/lazy-resolver';
import { FormRootError } from '@/components/forms/form-root-error';
import { useFocusServerError } from '@/components/forms/focus-server-error';
import { centiOf, implausibleReasons, isLate, toCreateReading, type ReadingFormValues } from './reading-form-values';
import { TakenAtField } from './taken-at-field';
import { ReadingPlacementPrompt, ReadingPlacementSettings, WeightHumidityFields } from './placement-fields';
import { placementDefaults, placementShort, type PlacementSettings } from './placement-values';

export interface ReadingFormProps {
  unit: TempUnit;
  timeZone: string;
  gapLimitCenti: number;
  defaults: { controlMode: ReadingFormValues['controlMode']; set: string; remoteSite: ReadingFormValues['remoteSite']; placement?: PlacementSettings | null };
  now?: () => Date;
  makeId?: () => string;
  busy?: boolean;
  /** Errors the server named, by field. */
  serverFields?: Record<string, string>;
  serverMessage?: string | null;
  onSubmit: (body: CreateReadingInput & { takenAt: string }) => void;
  onCancel?: () => void;
  /** Values to start from instead of the empty form (the nurse's own kept draft). */
  initialValues?: Partial<ReadingFormValues>;
  /** Called with every change of the values (keeps the draft; does not redraw the form). */
  onValuesChange?: (values: ReadingFormValues) => void;
  /**
   * Where the fields and the Save footer go. The record screen scrolls the fields and puts the
   * footer below the scrolling area, so Save is always on screen and no field is ever behind it.
   * Without it the footer simply follows the fields.
   */
  frame?: (fields: ReactNode, footer: ReactNode) => ReactNode;
}

/**
 * The routine check is five fields and Save, in the order she takes them: probe, remote site, the
 * air temperature (the air set temperature in air servo), heater output and heart rate. Enter (the
 * keypad's Next) moves to the next field and saves from the last; each field is one tap without
 * it. The settings (mode, set temperature, remote site) come forward from the last reading and
 * are shown; measurements are never filled in. Save is in a footer the host keeps on screen (`frame`).
 */
export function ReadingForm({
  unit,
  timeZone,
  gapLimitCenti,
  defaults,
  now = () => new Date(),
  makeId = () => globalThis.crypto.randomUUID(),
  busy,
  serverFields = {},
  serverMessage,
  onSubmit,
  onCancel,
  initialValues,
  onValuesChange,
  frame,
}: ReadingFormProps) {
  const theme = useTheme();
  const resolver = useMemo(() => lazyZodResolver<ReadingFormValues>((m) => m.readingFormResolverSchema(unit, timeZone, now)), [unit, timeZone, now]);
  useEffect(() => resolver.preload(), [resolver]);
  const { control, handleSubmit, setValue, setFocus, watch } = useForm<ReadingFormValues>({
    resolver,
    defaultValues: {
      probe: '',
      remote: '',
      remoteSite: defaults.remoteSite ?? 'axilla',
      air: '',
      set: defaults.set,
      controlMode: defaults.controlMode,
      heaterOutputPct: '',
      heartRate: '',
      heatSigns: [],
      note: '',
      time: '',
      day: '',
      lateReason: '',
      ...placementDefaults(defaults.placement),
      ...initialValues,
    },
  });
  // A subscription, not useWatch: keeping the draft must not redraw the form on each keystroke.
  const valuesChanged = useRef(onValuesChange);
  valuesChanged.current = onValuesChange;
  useEffect(() => {
    const sub = watch((values) => valuesChanged.current?.(values as ReadingFormValues));
    return () => sub.unsubscribe();
  }, [watch]);
  const controlMode = useWatch({ control, name: 'controlMode' });
  const airServo = controlMode === 'air-servo';
  const remoteRef = useRef<TextInput>(null);
  const thirdRef = useRef<TextInput>(null);
  const heaterRef = useRef<TextInput>(null);
  const heartRateRef = useRef<TextInput>(null);
  const [confirming, setConfirming] = useState<string[] | null>(null);
  // One id per reading: a retry after an error or a lost connection reuses it.
  const [id] = useState(makeId);
  const u = `°${unit}`;

  // Checked and sent once the tap's feedback is on screen: validating and re-rendering the whole
  // form as busy inside the tap held its next paint back (the slowest interaction of a check).
  const submit = (confirmed: boolean) => () =>
    afterNextPaint(
      () =>
        void handleSubmit((v) => {
          const reasons = implausibleReasons(v, unit);
          if (reasons.length > 0 && !confirmed) {
            setConfirming(reasons);
            return;
          }
          setConfirming(null);
          onSubmit(toCreateReading(v, { id, unit, now: now(), timeZone, confirmed: reasons.length > 0 }));
        })(),
    );

  const serverConfirm = serverFields.confirmedImplausible === 'confirm';
  // A refusal by the server focuses its first field, as the form's own checks do.
  useFocusServerError(serverConfirm ? undefined : serverFields, setFocus, SERVER_FIELD_ORDER);
  /** Enter or Next on a field: on to the next one, kept clear of the footer. */
  const next = (ref: React.RefObject<TextInput | null>) => ({
    returnKeyType: 'next' as const,
    blurOnSubmit: false,
    submitBehavior: 'submit' as const,
    onSubmitEditing: () => focusField(ref.current),
  });
  const setField = (label: string, inRoutine: boolean) => (
    <TextField
      ref={inRoutine ? thirdRef : undefined}
      control={control}
      name="set"
      label={label}
      hint={inRoutine && defaults.set ? `From the last reading: ${defaults.set} ${u}. Change it if the setting changed.` : undefined}
      suffix={u}
      inputMode="decimal"
      keyboardType="decimal-pad"
      serverError={serverFields.set}
      {...(inRoutine ? next(heaterRef) : {})}
    />
  );
  const airField = (inRoutine: boolean) => (
    <TextField
      ref={inRoutine ? thirdRef : undefined}
      control={control}
      name="air"
      label={`Air temperature (${u})`}
      suffix={u}
      inputMode="decimal"
      keyboardType="decimal-pad"
      serverError={serverFields.air}
      {...(inRoutine ? next(heaterRef) : {})}
    />
  );

  const fields = (
    <View style={styles.form}>
      <TextField
        control={control}
        name="probe"
        label={`Probe temperature (${u})`}
        suffix={u}
        inputMode="decimal"
        keyboardType="decimal-pad"
        autoFocus
        serverError={serverFields.probe}
        {...next(remoteRef)}
      />
      <TextField
        ref={remoteRef}
        control={control}
        name="remote"
        label={`Remote-site temperature (${u})`}
        suffix={u}
        inputMode="decimal"
        keyboardType="decimal-pad"
        serverError={serverFields.remote}
        {...next(thirdRef)}
      />
      <Watch control={control} name="remoteSite">
        {(remoteSite) => (
          <Segmented label="Remote site" value={remoteSite} options={REMOTE_SITE_OPTIONS} onChange={(site) => setValue('remoteSite', site, { shouldValidate: false })} />
        )}
      </Watch>
      <FieldError control={control} name="remoteSite" fallback={serverFields.remoteSite} />
      {airServo ? setField(`Air set temperature (${u})`, true) : airField(true)}
      <TextField
        ref={heaterRef}
        control={control}
        name="heaterOutputPct"
        label="Heater output (%)"
        suffix="%"
        inputMode="numeric"
        keyboardType="number-pad"
        serverError={serverFields.heaterOutputPct}
        {...next(heartRateRef)}
      />
      <TextField
        ref={heartRateRef}
        control={control}
        name="heartRate"
        label="Heart rate (/min)"
        suffix="/min"
        inputMode="numeric"
        keyboardType="number-pad"
        returnKeyType="done"
        blurOnSubmit={false}
        submitBehavior="submit"
        onSubmitEditing={() => void submit(false)()}
        serverError={serverFields.heartRate}
      />

      <WatchAll control={control}>{(values) => <Preview values={values} unit={unit} gapLimitCenti={gapLimitCenti} />}</WatchAll>
      <ReadingPlacementPrompt control={control} />

      <Card role="group" aria-label="Settings">
        <Text variant="title" role="heading" aria-level={2}>
          Settings
        </Text>
        <Text variant="caption" tone="muted">
          {carriedLine(defaults, u)}
        </Text>
        <Segmented label="Control mode" value={controlMode} options={CONTROL_MODE_OPTIONS} onChange={(mode) => setValue('controlMode', mode)} />
        {airServo ? null : setField(`Set temperature (${u})`, false)}
        <ReadingPlacementSettings control={control} setValue={setValue} />
      </Card>

      <Text variant="title" role="heading" aria-level={2}>
        More observations
      </Text>
      {airServo ? airField(false) : null}
      <View style={styles.wrap} role="group" aria-label="Heat-stress signs">
        <Text variant="label">Heat-stress signs</Text>
        <Watch control={control} name="heatSigns">
          {(heatSigns) => (
            <View style={styles.chips}>
              {HEAT_STRESS_SIGNS.map((s) => {
                const on = heatSigns?.includes(s.sign) ?? false;
                return (
                  <Pressable
                    key={s.sign}
                    role="checkbox"
                    aria-checked={on}
                    accessibilityLabel={s.label}
                    onPress={() => setValue('heatSigns', on ? heatSigns.filter((x) => x !== s.sign) : [...(heatSigns ?? []), s.sign])}
                    style={[styles.chip, { borderColor: on ? theme.colors.heat : theme.colors.border, backgroundColor: on ? theme.colors.heatSoft : theme.colors.surface }]}
                  >
                    <Text variant="label" style={{ color: on ? theme.colors.heat : theme.colors.text }}>
                      {on ? '☑ ' : '☐ '}
                      {s.label}
                    </Text>
                  </Pressable>
                );
              })}
            </View>
          )}
        </Watch>
      </View>
      <WeightHumidityFields control={control} serverFields={serverFields} />
      <TakenAtField control={control} timeZone={timeZone} now={now} label="Time taken (leave empty for now)" placeholder="Now" serverError={serverFields.takenAt} />
      <WatchAll control={control}>
        {(values) =>
          isLate(values, now(), timeZone) ? <TextField control={control} name="lateReason" label="Why is this charted late?" serverError={serverFields.lateReason} /> : null
        }
      </WatchAll>
      <TextField control={control} name="note" label="Note" multiline serverError={serverFields.note} />
    </View>
  );

  const footer = (
    <View style={styles.footer}>
      {confirming || serverConfirm ? (
        <Card style={{ borderColor: theme.colors.warning, backgroundColor: theme.colors.warningSoft }} role="alert">
          <StatusBadge tone="warning" icon="alert" label="Confirm unusual values" />
          {(
            confirming ??
            Object.entries(serverFields)
              .filter(([k]) => k !== 'confirmedImplausible')
              .map(([, v]) => v)
          ).map((r) => (
            <Text key={r}>{r}</Text>
          ))}
          <Button label="Confirm and save" variant="danger" onPress={() => void submit(true)()} busy={busy} />
        </Card>
      ) : null}
      <View style={styles.actions}>
        <Button label="Save reading" icon="check" style={styles.save} onPress={() => void submit(false)()} busy={busy} />
        {onCancel ? <Button label="Cancel" variant="quiet" onPress={onCancel} /> : null}
      </View>
      <FormRootError control={control} />
      {serverMessage && !serverConfirm ? (
        <Text tone="danger" role="alert">
          {serverMessage}
        </Text>
      ) : null}
    </View>
  );

  if (frame) return <>{frame(fields, footer)}</>;
  return (
    <View style={styles.form}>
      {fields}
      <View style={[styles.after, { borderTopColor: theme.colors.border }]}>{footer}</View>
    </View>
  );
}

/** The server's field names, in the form's order (takenAt is the time field). */
const SERVER_FIELD_ORDER = [
  ['probe', 'probe'],
  ['remote', 'remote'],
  ['air', 'air'],
  ['set', 'set'],
  ['heaterOutputPct', 'heaterOutputPct'],
  ['heartRate', 'heartRate'],
  ['takenAt', 'time'],
  ['lateReason', 'lateReason'],
  ['note', 'note'],
] as const;

/** What came forward from the last reading, in words. */
function carriedLine(defaults: ReadingFormProps['defaults'], u: string): string {
  const parts = [
    defaults.controlMode ? CONTROL_MODE_LABELS[defaults.controlMode] : null,
    defaults.set ? `set ${defaults.set} ${u}` : null,
    defaults.remoteSite ? `remote site ${SITE_LABELS[defaults.remoteSite].toLowerCase()}` : null,
    placementShort(defaults.placement),
  ].filter(Boolean);
  return parts.length ? `From the last reading: ${parts.join(', ')}. Change any that changed.` : 'No earlier reading: choose the settings.';
}

/** Focus a field and bring it to the middle of the screen, clear of the footer (web). */
function focusField(input: TextInput | null) {
  input?.focus();
  if (Platform.OS === 'web') (input as unknown as { scrollIntoView?: (o: object) => void } | null)?.scrollIntoView?.({ block: 'center' });
}

/**
 * Re-renders only its children when one field changes. Watching every value at the top of the
 * form re-rendered all its fields on each keystroke: about 100 ms a key on a throttled phone,
 * the slowest interaction in recording a reading (INP).
 */
function Watch<K extends keyof ReadingFormValues>({
  control,
  name,
  children,
}: {
  control: Control<ReadingFormValues>;
  name: K;
  children: (value: ReadingFormValues[K]) => ReactNode;
}) {
  const value = useWatch({ control, name }) as ReadingFormValues[K];
  return <>{children(value)}</>;
}

/** The same for the parts that depend on several values (the rules preview, the late-entry reason). */
function WatchAll({ control, children }: { control: Control<ReadingFormValues>; children: (values: ReadingFormValues) => ReactNode }) {
  const values = useWatch({ control }) as ReadingFormValues;
  return <>{children(values)}</>;
}

function FieldError({ control, name, fallback }: { control: Control<ReadingFormValues>; name: keyof ReadingFormValues; fallback?: string }) {
  const { errors } = useFormState({ control, name });
  const message = errors[name]?.message ?? fallback;
  return message ? (
    <Text variant="caption" tone="danger" role="alert">
      {message}
    </Text>
  ) : null;
}

/** What the rules will say about the values as typed: shown before saving. */
export function Preview({ values, unit, gapLimitCenti }: { values: ReadingFormValues; unit: TempUnit; gapLimitCenti: number }) {
  const probe = centiOf(values.probe ?? '', unit);
  const remote = centiOf(values.remote ?? '', unit);
  const heartRate = Number(values.heartRate) || null;
  const gap = probe !== null && remote !== null ? assessGapCenti(probe, remote, gapLimitCenti) : null;
  const band = remote !== null ? temperatureBand(remote) : null;
  const heat = heatStressPrompt({ remoteCenti: remote, heartRate, signs: values.heatSigns ?? [] });
  const implausible = implausibleReasons(values, unit);
  if (!gap && !band && !heat.raised && implausible.length === 0) return null;
  return (
    <Card role="status" aria-live="polite" aria-label="What the rules say">
      {gap ? (
        gap.exceeds ? (
          <StatusBadge tone="danger" icon="alert" label={`Gap ${tempDelta(gap.gapCenti, unit)}: over the ${tempDelta(gapLimitCenti, unit)} limit. A gap flag will be raised.`} />
        ) : (
          <StatusBadge tone="ok" icon="check" label={`Gap ${tempDelta(gap.gapCenti, unit)}: within the ${tempDelta(gapLimitCenti, unit)} limit.`} />
        )
      ) : null}
      {band ? (
        <StatusBadge
          tone={band === 'normal' ? 'ok' : band === 'hyperthermia' ? 'heat' : 'warning'}
          icon={band === 'normal' ? 'check' : band === 'hyperthermia' ? 'flame' : 'snow'}
          label={`Remote site: ${BAND_LABELS[band]}`}
        />
      ) : null}
      {heat.raised ? (
        <View style={{ gap: 4 }}>
          <StatusBadge tone="heat" icon="flame" label="Heat-stress prompt" />
          {HEAT_STRESS_CHECKLIST.map((step) => (
            <Text key={step} variant="caption">
              • {step}
            </Text>
          ))}
        </View>
      ) : null}
      {implausible.map((r) => (
        <StatusBadge key={r} tone="warning" icon="alert" label={r} />
      ))}
      <Caution />
    </Card>
  );
}

const styles = StyleSheet.create({
  form: { gap: 14, width: '100%', maxWidth: 560 },
  actions: { flexDirection: 'row', gap: 12, flexWrap: 'wrap' },
  save: { flexGrow: 1 },
  footer: { gap: 8, width: '100%', maxWidth: 560 },
  after: { paddingVertical: 10, borderTopWidth: StyleSheet.hairlineWidth },
  wrap: { gap: 6 },
  chips: { flexDirection: 'row', flexWrap: 'wrap', gap: 8 },
  chip: { minHeight: TOUCH_TARGET, paddingHorizontal: 12, borderRadius: 10, borderWidth: 2, justifyContent: 'center' },
});
