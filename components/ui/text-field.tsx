import { forwardRef, useCallback } from 'react';
import { useController, type Control, type FieldValues, type Path } from 'react-hook-form';
import { Platform, StyleSheet, TextInput, View, type TextInputProps } from 'react-native';
import { TOUCH_TARGET } from '@/components/theme/theme';
import { useTheme } from '@/components/theme/theme-provider';
import { Text } from './text';

export interface TextFieldProps<T extends FieldValues> extends Omit<TextInputProps, 'value' | 'onChangeText' | 'onBlur'> {
  control: Control<T>;
  name: Path<T>;
  label: string;
  hint?: string;
  suffix?: string;
  /** An error from the server for this field, shown like a local one. */
  serverError?: string;
}

/** One labelled input bound to react-hook-form; its error is announced and tied to the field. */
function TextFieldInner<T extends FieldValues>({ control, name, label, hint, suffix, serverError, style, ...rest }: TextFieldProps<T>, ref: React.ForwardedRef<TextInput>) {
  const theme = useTheme();
  const { field, fieldState } = useController({ control, name });
  const error = fieldState.error?.message ?? serverError;
  const id = `field-${String(name).replace(/\W/g, '-')}`;
  // One input, two refs: the caller's (Enter moves to the next field) and the form's, so a Save with
  // errors focuses the first field at fault (react-hook-form's shouldFocusError) and, on the web,
  // brings it to the middle of the screen, clear of a sticky footer.
  const { ref: formRef } = field;
  const setRef = useCallback(
    (node: TextInput | null) => {
      if (typeof ref === 'function') ref(node);
      else if (ref) ref.current = node;
      formRef(node ? { focus: () => focusAndReveal(node) } : null);
    },
    [ref, formRef],
  );
  return (
    <View style={styles.wrap}>
      <Text variant="label" nativeID={`${id}-label`}>
        {label}
      </Text>
      {hint ? (
        <Text variant="caption" tone="muted" nativeID={`${id}-hint`}>
          {hint}
        </Text>
      ) : null}
      <View style={styles.row}>
        <TextInput
          ref={setRef}
          value={field.value == null ? '' : String(field.value)}
          onChangeText={field.onChange}
          onBlur={field.onBlur}
          accessibilityLabel={label}
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${id}-error` : hint ? `${id}-hint` : undefined}
          placeholderTextColor={theme.colors.textMuted}
          {...rest}
          style={[
            styles.input,
            theme.type.body,
            {
              color: theme.colors.text,
              backgroundColor: theme.colors.surfaceSunken,
              borderColor: error ? theme.colors.danger : theme.colors.border,
            },
            style,
          ]}
        />
        {suffix ? (
          <Text variant="bodyStrong" tone="muted" style={styles.suffix}>
            {suffix}
          </Text>
        ) : null}
      </View>
      {error ? (
        <Text variant="caption" tone="danger" nativeID={`${id}-error`} accessibilityLiveRegion="polite" role="alert">
          {error}
        </Text>
      ) : null}
    </View>
  );
}

/** Focus an input and, on the web, scroll it to the middle of its scrolling container. */
export function focusAndReveal(node: TextInput): void {
  node.focus();
  if (Platform.OS === 'web') (node as unknown as { scrollIntoView?: (o: object) => void }).scrollIntoView?.({ block: 'center' });
}

export const TextField = forwardRef(TextFieldInner) as <T extends FieldValues>(props: TextFieldProps<T> & { ref?: React.ForwardedRef<TextInput> }) => React.ReactElement;

const styles = StyleSheet.create({
  wrap: { gap: 4 },
  row: { flexDirection: 'row', alignItems: 'center', gap: 8 },
  input: { flex: 1, minHeight: TOUCH_TARGET, borderWidth: 2, borderRadius: 10, paddingHorizontal: 12 },
  suffix: { minWidth: 32 },
});
