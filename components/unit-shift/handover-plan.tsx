import { useState } from 'react';
import { StyleSheet, TextInput, View } from 'react-native';
import { problemOf } from '@/components/api/client';
import { useTheme } from '@/components/theme/theme-provider';
import { Button } from '@/components/ui/button';
import { Text } from '@/components/ui/text';
import { PrintOnly } from './print-page';
import { usePlanQuery, useWritePlanMutation } from './queries';

/**
 * The infant's plan for the next shift, written on the handover screen: on screen a text box and
 * Save (each save a new version), on paper the saved text and who wrote it.
 */
export function HandoverPlanField({ infantId, canWrite }: { infantId: string; canWrite: boolean }) {
  const { colors } = useTheme();
  const query = usePlanQuery(infantId);
  const write = useWritePlanMutation(infantId);
  const [draft, setDraft] = useState<string | null>(null);
  const saved = query.data?.plan ?? '';
  const text = draft ?? saved;
  const problem = write.error ? problemOf(write.error) : null;
  const field = problem && 'fields' in problem ? problem.fields?.plan : undefined;
  const shown = query.data ? (
    <Text>
      {query.data.plan}
      <Text variant="caption" tone="muted">{`\nWritten by ${query.data.writtenBy ?? 'unknown'}`}</Text>
    </Text>
  ) : (
    <Text tone="muted">No plan written for this shift.</Text>
  );
  return (
    <View style={styles.box} data-print-block>
      <Text variant="title" aria-level={3}>
        Plan
      </Text>
      {canWrite ? (
        <View style={styles.editor} data-noprint="">
          <TextInput
            multiline
            aria-label="Plan for the next shift"
            value={text}
            onChangeText={setDraft}
            placeholder="What the next nurse should do or watch for"
            style={[styles.input, { borderColor: field ? colors.danger : colors.border, color: colors.text, backgroundColor: colors.surface }]}
          />
          {problem ? (
            <Text tone="danger" role="alert">
              {field ?? problem.message}
            </Text>
          ) : null}
          <Button
            label="Save plan"
            compact
            variant="secondary"
            disabled={draft === null || draft === saved}
            busy={write.isPending}
            onPress={() => write.mutate(text, { onSuccess: () => setDraft(null) })}
          />
        </View>
      ) : null}
      {canWrite ? <PrintOnly>{shown}</PrintOnly> : shown}
    </View>
  );
}

const styles = StyleSheet.create({
  box: { gap: 8 },
  editor: { gap: 8 },
  input: { minHeight: 96, borderWidth: 1, borderRadius: 8, padding: 10, fontSize: 16, textAlignVertical: 'top' },
});
