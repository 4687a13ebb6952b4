import { Text } from '@/components/ui/text';

/** On a device the handover is read on screen; printing and the CSV are on the web. */
export function HandoverActions(_props: { infantIds: string[] }) {
  return (
    <Text variant="caption" tone="muted">
      Print the handover or download its readings from Warmfold on a computer.
    </Text>
  );
}
