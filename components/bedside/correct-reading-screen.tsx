import { useRouter } from 'expo-router';
import { useState } from 'react';
import { problemOf } from '@/components/api/client';
import { useUser } from '@/components/auth/auth-provider';
import { useCorrectReadingMutation, useFlowsheetQuery } from '@/components/queries/infants';
import { Screen } from '@/components/ui/screen';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/state-view';
import { CorrectReadingForm } from './correct-reading-form';
import { readingDrafts } from './reading-draft';

export function CorrectReadingScreen({ infantId, readingId }: { infantId: string; readingId: string }) {
  const user = useUser();
  const router = useRouter();
  // The widest window, so a reading from an earlier shift can still be corrected.
  const sheet = useFlowsheetQuery(infantId, 72);
  const mutation = useCorrectReadingMutation(infantId);
  const [fields, setFields] = useState<Record<string, string>>({});
  const back = () => router.replace(`/infants/${infantId}`);

  if (sheet.isError && !sheet.data) return <ErrorState error={sheet.error} onRetry={() => void sheet.refetch()} />;
  if (!sheet.data) return <LoadingState label="Opening the reading…" />;
  const reading = sheet.data.readings.find((r) => r.id === readingId || r.rootId === readingId);
  const title = `Correct: ${sheet.data.infant.bedLabel ?? ''} ${sheet.data.infant.displayName}`;
  if (!reading) {
    return (
      <Screen title={title}>
        <EmptyState title="This reading cannot be corrected here" message="It is not in the last 72 hours, or it has been removed." />
      </Screen>
    );
  }
  const problem = mutation.isError ? problemOf(mutation.error) : null;
  return (
    <Screen title={title} subtitle={`Temperatures in °${user.tempUnit}`}>
      <CorrectReadingForm
        reading={reading}
        unit={user.tempUnit}
        timeZone={sheet.data.infant.timeZone}
        clock={user.clock}
        busy={mutation.isPending}
        serverFields={fields}
        serverMessage={problem?.message}
        onCancel={back}
        draft={{ userId: user.id, infantId, label: [sheet.data.infant.bedLabel, sheet.data.infant.displayName].filter(Boolean).join(' ') }}
        onSubmit={(body) =>
          mutation.mutate(
            // Always correct the current version: an older one is refused by the server.
            { readingId: reading.id, body },
            {
              onSuccess: () => {
                readingDrafts.removeReading(body.id);
                setFields({});
                back();
              },
              onError: (err) => {
                const p = problemOf(err);
                setFields('fields' in p && p.fields ? p.fields : {});
              },
            },
          )
        }
      />
    </Screen>
  );
}
