import { Link } from 'expo-router';
import { useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
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
import type { AdmitForm, AssignNurseInput } from '@/shared/schemas/unit';
import { CONTROL_MODE_LABELS, CONTROL_MODES, HEAT_SOURCE_LABELS, HEAT_SOURCES, INFANT_SEX_LABELS, INFANT_SEXES } from '@/shared/vocabulary';
import type { BoardBed, BoardResponse } from '@/shared/types/board';
import type { BedWarming } from '@/shared/schemas/warming';
import { admitDefaultsFromWarming, WarmingForm } from '@/components/unit-shift/warming';

const admitResolver = lazyZodResolver<AdmitForm>((m) => m.admitFormSchema);
const assignResolver = lazyZodResolver<AssignNurseInput>((m) => m.assignNurseSchema);

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
  const { control, handleSubmit } = useForm<AdmitForm>({
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
        render={({ field }) => <Segmented label="Sex" value={field.value} onChange={field.onChange} options={INFANT_SEXES.map((v) => ({ value: v, label: INFANT_SEX_LABELS[v] }))} />}
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
        render={({ field }) => <Segmented label="Heat source" value={field.value} onChange={field.onChange} options={HEAT_SOURCES.map((v) => ({ value: v, label: HEAT_SOURCE_LABELS[v] }))} />}
      />
      <Controller
        control={control}
        name="controlMode"
        render={({ field }) => <Segmented label="Control mode" value={field.value} onChange={field.onChange} options={CONTROL_MODES.map((v) => ({ value: v, label: CONTROL_MODE_LABELS[v] }))} />}
      />
      <TextField control={control} name="setTemperature" label="Set temperature" suffix={`°${tempUnit}`} keyboardType="decimal-pad" serverError={fields.setTemperature} />
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

function OccupiedBed({ board, bed, onDone }: { board: BoardResponse; bed: BoardBed; onDone: () => void }) {
  const infant = bed.infant!;
  const assign = useAssignNurseMutation(board.unit.id);
  const move = useMoveInfantMutation();
  const update = useUpdateInfantMutation();
  const discharge = useDischargeInfantMutation();
  const [target, setTarget] = useState<string | null>(null);
  const [heatSource, setHeatSource] = useState(infant.heatSource);
  const [confirming, setConfirming] = useState(false);
  const { control, handleSubmit } = useForm<AssignNurseInput>({
    resolver: assignResolver,
    defaultValues: { infantId: infant.id, nurseId: infant.assignedNurse?.id ?? '', shift: 'current' },
  });
  const emptyBeds = board.beds.filter((b) => b.infant === null);
  const failure = [assign.error, move.error, update.error, discharge.error].find(Boolean);

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
        <Button label="Move" variant="secondary" disabled={!target} busy={move.isPending} onPress={() => target && move.mutate({ infantId: infant.id, bedId: target }, { onSuccess: onDone })} />
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
        {confirming ? (
          <Button label={`Confirm discharge of ${infant.displayName}`} variant="danger" busy={discharge.isPending} onPress={() => discharge.mutate({ infantId: infant.id }, { onSuccess: onDone })} />
        ) : (
          <Button label="Discharge…" variant="quiet" onPress={() => setConfirming(true)} />
        )}
      </View>
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
