import { Text } from '@/components/ui/text';

/** Uploads are made from a computer's browser; phones show how. */
export function FilePicker({ label }: { label: string; onPick: (file: File) => void }) {
  return <Text tone="muted">{label}: open Warmfold in a computer&apos;s browser to upload a file.</Text>;
}
