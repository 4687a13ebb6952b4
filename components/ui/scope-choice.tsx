import { Segmented } from './segmented';

export type Scope = 'mine' | 'unit';

const OPTIONS: { value: Scope; label: string }[] = [
  { value: 'mine', label: 'My infants' },
  { value: 'unit', label: 'Whole unit' },
];

/** My infants or the whole unit: the same choice on My infants and on the handover. */
export function ScopeChoice({ label, value, onChange }: { label: string; value: Scope; onChange: (value: Scope) => void }) {
  return <Segmented label={label} value={value} options={OPTIONS} onChange={onChange} />;
}
