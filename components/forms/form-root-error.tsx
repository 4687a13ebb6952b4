import { useFormState, type Control, type FieldValues } from 'react-hook-form';
import { Text } from '@/components/ui/text';

/**
 * A form-wide problem from the resolver, such as its checks failing to load on a dropped
 * connection (components/forms/lazy-resolver.ts). Field problems show beside their fields.
 */
export function FormRootError<T extends FieldValues>({ control }: { control: Control<T> }) {
  const { errors } = useFormState({ control });
  const message = errors.root?.message;
  if (!message) return null;
  return (
    <Text tone="danger" role="alert">
      {message}
    </Text>
  );
}
