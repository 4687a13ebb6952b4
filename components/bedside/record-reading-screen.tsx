import { useRouter } from 'expo-router';
import { useEffect, useState } from 'react';
import { fromCentiCelsius } from '@/shared/thermal/units';
import { problemOf } from '@/components/api/client';
import { useUser } from '@/components/auth/auth-provider';
import { useCreateReadingMutation, useFlowsheetQuery, useInfantQuery } from '@/components/queries/infants';
import { useQueryClient } from '@tanstack/react-query';
import { Screen } from '@/components/ui/screen';
import { ErrorState, LoadingState } from '@/components/ui/state-view';
import { startPendingFlush } from './pending-readings';
import { ReadingForm } from './reading-form';

export function RecordReadingScreen({ infantId }: { infantId: string }) {
  const user = useUser();
  const router = useRouter();
  const queryClient = useQueryClient();
  const infant = useInfantQuery(infantId);
  const sheet = useFlowsheetQuery(infantId, 12);
  const mutation = useCreateReadingMutation(infantId);
  const [fields, setFields] = useState<Record<string, string>>({});
  useEffect(() => startPendingFlush(queryClient), [queryClient]);

  if (infant.isError && !infant.data) return <ErrorState error={infant.error} onRetry={() => void infant.refetch()} />;
  if (!infant.data) return <LoadingState label="Opening the record form…" />;
  const d = infant.data;
  const problem = mutation.isError ? problemOf(mutation.error) : null;
  return (
    <Screen title={`Record: ${d.infant.bedLabel ?? ''} ${d.infant.displayName}`} subtitle={`Temperatures in °${user.tempUnit}`}>
      <ReadingForm
        unit={user.tempUnit}
        timeZone={d.timeZone}
        gapLimitCenti={sheet.data?.policy.gapLimitCenti ?? 50}
        defaults={{
          controlMode: d.defaults.controlMode,
          set: d.defaults.setCenti === null ? '' : fromCentiCelsius(d.defaults.setCenti, user.tempUnit).toFixed(1),
          remoteSite: d.defaults.remoteSite,
        }}
        busy={mutation.isPending}
        serverFields={fields}
        serverMessage={problem?.message}
        onCancel={() => router.back()}
        onSubmit={(body) =>
          mutation.mutate(body, {
            onSuccess: () => {
              setFields({});
              router.replace(`/infants/${infantId}`);
            },
            onError: (err) => {
              const p = problemOf(err);
              setFields('fields' in p && p.fields ? p.fields : {});
            },
          })
        }
      />
    </Screen>
  );
}
