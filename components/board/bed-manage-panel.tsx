import { Link } from 'expo-router';
import { useState } from 'react';
import { Controller, useForm, useFormState, useWatch, type Control, type UseFormSetValue } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { problemOf } from '@/components/api/client';
import { lazyZodResolver, loadSchemas } from '@/components/forms/lazy-resolver';
import { FormRootError } from '@/components/forms/form-root-error';
import { useAdmitInfantMutation, useAssignNurseMutation, useDischargeInfantMutation, useMoveInfantMutation, useUpdateInfantMutation } from '@/components/queries/board';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Segmented } from '@/components/ui/segmented';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import type { AdmitForm as AdmitFormValues, AssignNurseInput, DischargeInfantInput } from '@/shared/schemas/unit';
import {
  CONTROL_MODE_LABELS,
  CONTROL_MODES,
  DISCHARGE_DESTINATION_ALLOWED,
  DISCHARGE_REASON_LABELS,
  DISCHARGE_REASONS,
  HEAT_SOURCE_LABELS,
  HEAT_SOURCES,
  INFANT_SEX_LABELS,
  INFANT_SEXES,
} from '@/shared/vocabulary';
import { placementPrompt } from '@/shared/thermal/placement';
import { AxillaProbeNote, PlacementChoices, PlacementPromptNote } from '@/components/bedside/placement-fields';
import { flagLook } from './flag-look';
import type { BoardBed, BoardResponse } from '@/shared/types/board';
import type { BedWarming } from '@/shared/schemas/warming';
import { admitDefaultsFromWarming, WarmingForm } from '@/components/unit-shift/warming';

const admitResolver = lazyZodResolver<AdmitFormValues>((m) => m.admitFormSchema);
const assignResolver = lazyZodResolver<AssignNurseInput>((m) => m.assignNurseSchema);
const dischargeResolver = lazyZodResolver<DischargeInfantInput>((m) => m.dischargeInfantSchema);

export interface BedManagePanelProps {
  board: BoardResponse;
  bed: BoardBed;
  tempUnit: 'C' | 'F';
  onClose: () => void;
  /** The empty bed's warming for an admission, if any: the admission starts from its settings. */
  warming?: BedWarming;
}

/** The charge nurse's work on one bed: admit to it when empty; otherwise reassign, move, change or discharge. */
/** Shown in the board's dialog (components/ui/sheet.tsx), which carries the bed's name and Close. */
export function BedManagePanel({ board, bed, tempUnit, onClose, warming }: BedManagePanelProps) {
  const [warmingOpen, setWarmingOpen] = useState(false);
  return (
    <View style={styles.panel} role="region" aria-label={`Bed ${bed.label} actions`}>
      {bed.infant ? (
        <OccupiedBed board={board} bed={bed} onDone={onClose} />
      ) : (
        <>
          <Card style={styles.form}>
            <Text variant="title" aria-level={3}>
              {warming ? 'Warming for an admission' : 'Warm this bed for an admission'}
            </Text>
            {warming || warmingOpen ? (
              <WarmingForm unitId={board.unit.id} bedId={bed.bedId} bedLabel={bed.label} warming={warming} tempUnit={tempUnit} onDone={onClose} />
            ) : (
              <Button label={`Warm ${bed.label} for an admission`} icon="thermometer" variant="secondary" compact onPress={() => setWarmingOpen(true)} />
            )}
          </Card>
          <Text variant="title" aria-level={3}>
            Admit
          </Text>
          <AdmitForm unitId={board.unit.id} bed={bed} tempUnit={tempUnit} onDone={onClose} warming={warming} />
        </>
      )}
    </View>
  );
}

function AdmitForm({ unitId, bed, tempUnit, onDone, warming }: { unitId: string; bed: BoardBed; tempUnit: 'C' | 'F'; onDone: () => void; warming?: BedWarming }) {
  const admit = useAdmitInfantMutation(unitId);
  const today = new Date();
  const pad = (n: number) => String(n).padStart(2, '0');
  const { control, handleSubmit, setValue } = useForm<AdmitFormValues>({
    resolver: admitResolver,
    defaultValues: {
      displayName: '',
      birthDate: `${today.getFullYear()}-${pad(today.getMonth() + 1)}-${pad(today.getDate())}`,
      birthTime: '',
      gestationWeeks: '',
      gestationDays: '0',
      birthWeightGrams: '',
      heatSource: 'incubator',
      controlMode: 'skin-servo',
      setTemperature: '',
      hospitalNumber: '',
      sex: 'unknown',
      probeSite: null,
      probeCovered: null,
      position: null,
      // A bed warmed for this admission: its heat source, mode and set temperature.
      ...admitDefaultsFromWarming(warming, tempUnit),
    },
  });
  const problem = admit.error ? problemOf(admit.error) : null;
  const fields = problem && 'fields' in problem ? (problem.fields ?? {}) : {};
  // The schemas are loaded by now (the resolver just ran), so this resolves at once.
  const submit = handleSubmit(async (form) => {
    const { admitFormToInput } = await loadSchemas();
    admit.mutate(admitFormToInput(form, bed.bedId, tempUnit), { onSuccess: onDone });
  });
  return (
    <View style={styles.form}>
      <TextField control={control} name="displayName" label="Display name" hint="As the unit shows it, for example Baby Larchmont." serverError={fields.displayName} />
      <TextField control={control} name="hospitalNumber" label="Hospital number" hint="As on the wristband." serverError={fields.hospitalNumber} />
      <Controller
        control={control}
        name="sex"
        render={({ field }) => (
          <Segmented label="Sex" value={field.value} onChange={field.onChange} options={INFANT_SEXES.map((v) => ({ value: v, label: INFANT_SEX_LABELS[v] }))} />
        )}
      />
      <View style={styles.row}>
        <View style={styles.cell}>
          <TextField control={control} name="birthDate" label="Date of birth" hint="YYYY-MM-DD" serverError={fields.birthAt} />
        </View>
        <View style={styles.cell}>
          <TextField control={control} name="birthTime" label="Time of birth" hint="HH:MM, 24-hour" />
        </View>
      </View>
      <View style={styles.row}>
        <View style={styles.cell}>
          <TextField control={control} name="gestationWeeks" label="Gestation: weeks" keyboardType="number-pad" serverError={fields.gestationWeeks} />
        </View>
        <View style={styles.cell}>
          <TextField control={control} name="gestationDays" label="and days" keyboardType="number-pad" serverError={fields.gestationDays} />
        </View>
        <View style={styles.cell}>
          <TextField control={control} name="birthWeightGrams" label="Birth weight" suffix="g" keyboardType="number-pad" serverError={fields.birthWeightGrams} />
        </View>
      </View>
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
      <AdmitPlacement control={control} setValue={setValue} />
      {problem ? (
        <Text tone="danger" role="alert">
          {problem.message}
        </Text>
      ) : null}
      <FormRootError control={control} />
      <Button label={`Admit to ${bed.label}`} icon="plus" busy={admit.isPending} onPress={() => void submit()} />
    </View>
  );
}

/** The probe's place on admission: charted with the admission's settings and carried forward from there. */
function AdmitPlacement({ control, setValue }: { control: Control<AdmitFormValues>; setValue: UseFormSetValue<AdmitFormValues> }) {
  const [probeSite, probeCovered, position] = useWatch({ control, name: ['probeSite', 'probeCovered', 'position'] });
  return (
    <>
      <PlacementChoices
        value={{ probeSite: probeSite ?? null, probeCovered: probeCovered ?? null, position: position ?? null }}
        onChange={(next) => {
          setValue('probeSite', next.probeSite);
          setValue('probeCovered', next.probeCovered);
          setValue('position', next.position);
        }}
      />
      <PlacementPromptNote code={placementPrompt({ probeSite: probeSite ?? null, position: position ?? null })} />
      <AxillaProbeNote probeSite={probeSite} />
    </>
  );
}

function OccupiedBed({ board, bed, onDone }: { board: BoardResponse; bed: BoardBed; onDone: () => void }) {
  const infant = bed.infant!;
  const assign = useAssignNurseMutation(board.unit.id);
  const move = useMoveInfantMutation();
  const update = useUpdateInfantMutation();
  const discharge = useDischargeInfantMutation();
  const [target, setTarget] = useState<string | null>(null);
  const [heatSource, setHeatSource] = useState(infant.heatSource);
  const [discharging, setDischarging] = useState(false);
  const { control, handleSubmit } = useForm<AssignNurseInput>({
    resolver: assignResolver,
    defaultValues: { infantId: infant.id, nurseId: infant.assignedNurse?.id ?? '', shift: 'current' },
  });
  const emptyBeds = board.beds.filter((b) => b.infant === null);
  const failure = [assign.error, move.error, update.error].find(Boolean);

  return (
    <View style={styles.form}>
      <View style={styles.section}>
        <Controller
          control={control}
          name="nurseId"
          render={({ field, fieldState }) => (
            <>
              <Segmented label="Assigned nurse" value={field.value} onChange={field.onChange} options={board.nurses.map((n) => ({ value: n.id, label: n.name }))} />
              {fieldState.error ? <Text tone="danger">{fieldState.error.message}</Text> : null}
            </>
          )}
        />
        <Controller
          control={control}
          name="shift"
          render={({ field }) => (
            <Segmented
              label="For"
              value={field.value ?? 'current'}
              onChange={field.onChange}
              options={[
                { value: 'current', label: 'This shift' },
                { value: 'next', label: 'Next shift' },
              ]}
            />
          )}
        />
        <FormRootError control={control} />
        <Button label="Assign" icon="users" busy={assign.isPending} onPress={() => void handleSubmit((input) => assign.mutate(input, { onSuccess: onDone }))()} />
      </View>

      <View style={styles.section}>
        <Segmented label="Move to an empty bed" value={target} onChange={setTarget} options={emptyBeds.map((b) => ({ value: b.bedId, label: b.label }))} />
        <Button
          label="Move"
          variant="secondary"
          disabled={!target}
          busy={move.isPending}
          onPress={() => target && move.mutate({ infantId: infant.id, bedId: target }, { onSuccess: onDone })}
        />
      </View>

      <View style={styles.section}>
        <Segmented label="Heat source" value={heatSource} onChange={setHeatSource} options={HEAT_SOURCES.map((v) => ({ value: v, label: HEAT_SOURCE_LABELS[v] }))} />
        <Button
          label="Change heat source"
          variant="secondary"
          disabled={heatSource === infant.heatSource}
          busy={update.isPending}
          onPress={() => update.mutate({ infantId: infant.id, heatSource }, { onSuccess: onDone })}
        />
      </View>

      <View style={styles.actions}>
        <Link href={`/handover/${infant.id}`} asChild>
          <Button label="Handover" icon="print" variant="secondary" />
        </Link>
        {discharging ? null : <Button label="Discharge…" variant="quiet" onPress={() => setDischarging(true)} />}
      </View>
      {discharging ? <DischargeForm infant={infant} discharge={discharge} onCancel={() => setDischarging(false)} onDone={onDone} /> : null}
      {failure ? (
        <Text tone="danger" role="alert">
          {problemOf(failure).message}
        </Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  panel: { gap: 12 },
  header: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', gap: 8, flexWrap: 'wrap' },
  form: { gap: 16 },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: 12 },
  cell: { flexGrow: 1, flexBasis: 160 },
  section: { gap: 8 },
  actions: { flexDirection: 'row', gap: 8, flexWrap: 'wrap' },
});

/**
 * Discharge: why the infant is leaving and, for a transfer, where to (a ward may be named). The
 * infant's open flags are listed first: the discharge closes them, with the discharge as the
 * reason.
 */
function DischargeForm({
  infant,
  discharge,
  onCancel,
  onDone,
}: {
  infant: NonNullable<BoardBed['infant']>;
  discharge: ReturnType<typeof useDischargeInfantMutation>;
  onCancel: () => void;
  onDone: () => void;
}) {
  const { control, handleSubmit, setValue } = useForm<DischargeInfantInput>({
    resolver: dischargeResolver,
    defaultValues: { reason: undefined, destination: '', note: '' },
  });
  const reason = useWatch({ control, name: 'reason' });
  const { errors } = useFormState({ control, name: 'reason' });
  const problem = discharge.error ? problemOf(discharge.error) : null;
  const fields = problem && 'fields' in problem ? (problem.fields ?? {}) : {};
  const withDestination = reason !== undefined && DISCHARGE_DESTINATION_ALLOWED.includes(reason);
  const submit = handleSubmit((input) =>
    discharge.mutate(
      {
        infantId: infant.id,
        reason: input.reason,
        ...(withDestination && input.destination?.trim() ? { destination: input.destination.trim() } : {}),
        ...(input.note?.trim() ? { note: input.note.trim() } : {}),
      },
      { onSuccess: onDone },
    ),
  );
  return (
    <View style={styles.section} role="group" aria-label={`Discharge ${infant.displayName}`}>
      <Text variant="title" aria-level={3}>
        Discharge {infant.displayName}
      </Text>
      {infant.openFlags.length ? (
        <View role="list" aria-label="Open flags the discharge closes" style={styles.section}>
          <Text variant="label">These open flags close with the discharge as the reason:</Text>
          {infant.openFlags.map((f) => (
            <Text key={f.id ?? f.key} role="listitem">
              • {flagLook(f).label}
            </Text>
          ))}
        </View>
      ) : (
        <Text tone="muted">No open flags.</Text>
      )}
      <Segmented
        label="Leaving for"
        value={reason ?? null}
        options={DISCHARGE_REASONS.map((v) => ({ value: v, label: DISCHARGE_REASON_LABELS[v] }))}
        onChange={(v) => setValue('reason', v, { shouldValidate: errors.reason !== undefined })}
      />
      {errors.reason?.message || fields.reason ? (
        <Text variant="caption" tone="danger" role="alert">
          {errors.reason?.message ?? fields.reason}
        </Text>
      ) : null}
      {withDestination ? (
        <TextField
          control={control}
          name="destination"
          label={reason === 'transfer' ? 'Transferred to (unit and hospital)' : 'Which ward (optional)'}
          serverError={fields.destination}
        />
      ) : null}
      <TextField control={control} name="note" label="Note (optional)" multiline serverError={fields.note} />
      <FormRootError control={control} />
      <View style={styles.actions}>
        <Button label={`Confirm discharge of ${infant.displayName}`} variant="danger" busy={discharge.isPending} onPress={() => void submit()} />
        <Button label="Cancel" variant="quiet" onPress={onCancel} />
      </View>
      {problem ? (
        <Text tone="danger" role="alert">
          {problem.message}
        </Text>
      ) : null}
    </View>
  );
}
