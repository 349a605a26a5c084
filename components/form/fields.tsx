import React from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { useController, type Control, type FieldValues, type Path } from 'react-hook-form';
import { errorMessage } from '../../hooks/forms';
import { colors, fonts, space, touch } from '../theme';
import { Choice, Field, MultiChoice, T } from '../ui';

/**
 * The UI kit's fields bound to a react-hook-form form (`useZodForm` in hooks/forms.ts): each shows its label, its value
 * and the message of its error (the schema's or the server's) under it. `name` is the field's path in the schema.
 */
type Bound<F extends FieldValues> = {
  // The form's third type (its submit output) does not matter to a field.
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  control: Control<F, any, any>;
  name: Path<F>;
};

type FieldProps = React.ComponentProps<typeof Field>;

/** A labelled text field bound to a form; `onChangeText` is told of each change as well. */
export function FormTextField<F extends FieldValues>({
  control,
  name,
  onChangeText,
  ...rest
}: Bound<F> & Omit<FieldProps, 'value' | 'error' | 'onBlur'>) {
  const { field, fieldState } = useController({ control, name });
  return (
    <Field
      {...rest}
      value={typeof field.value === 'string' ? field.value : field.value == null ? '' : String(field.value)}
      onChangeText={(text) => {
        field.onChange(text);
        onChangeText?.(text);
      }}
      onBlur={field.onBlur}
      error={errorMessage(fieldState.error)}
    />
  );
}

/**
 * A number entered as text (decimal keyboard, tabular figures): the form holds the text as typed and the form's
 * `toInput` reads the number, so a half-typed value is never lost or rewritten.
 */
export function FormNumberField<F extends FieldValues>(
  props: Bound<F> & Omit<FieldProps, 'value' | 'error' | 'onBlur'>,
) {
  return <FormTextField numeric {...props} />;
}

/** One of a few options (segmented), with its error under it. */
export function FormChoice<F extends FieldValues, V extends string>({
  control,
  name,
  label,
  options,
  testID,
  onChange,
}: Bound<F> & {
  label?: string;
  options: readonly { value: V; label: string }[];
  testID?: string;
  onChange?: (v: V) => void;
}) {
  const { field, fieldState } = useController({ control, name });
  const error = errorMessage(fieldState.error);
  return (
    <View style={styles.choice}>
      <Choice
        label={label}
        value={field.value as V}
        options={options}
        onChange={(v) => {
          field.onChange(v);
          onChange?.(v);
        }}
        testID={testID}
      />
      {error ? (
        <T variant="small" style={styles.error} accessibilityRole="alert">
          {error}
        </T>
      ) : null}
    </View>
  );
}

/** Several of a few options (chips), with the first message of the list or its items under it. */
export function FormMultiChoice<F extends FieldValues, V extends string>({
  control,
  name,
  label,
  options,
  testID,
}: Bound<F> & { label?: string; options: readonly { value: V; label: string }[]; testID?: string }) {
  const { field, fieldState } = useController({ control, name });
  return (
    <MultiChoice
      label={label}
      values={(field.value ?? []) as V[]}
      options={options}
      onChange={field.onChange}
      error={errorMessage(fieldState.error)}
      testID={testID}
    />
  );
}

/** A box to tick (e.g. a confirmation the schema requires), its text beside it and its error under it. */
export function FormCheckbox<F extends FieldValues>({
  control,
  name,
  label,
  testID,
}: Bound<F> & { label: string; testID?: string }) {
  const { field, fieldState } = useController({ control, name });
  const on = field.value === true;
  const error = errorMessage(fieldState.error);
  return (
    <>
      <Pressable
        accessibilityRole="checkbox"
        aria-checked={on}
        testID={testID}
        onPress={() => field.onChange(!on)}
        style={styles.checkbox}
      >
        <View style={[styles.box, on && styles.boxOn, !!error && styles.boxError]}>
          {on ? <T style={styles.tick}>✓</T> : null}
        </View>
        <T style={styles.checkboxLabel}>{label}</T>
      </Pressable>
      {error ? (
        <T variant="small" style={styles.error} accessibilityRole="alert">
          {error}
        </T>
      ) : null}
    </>
  );
}

const styles = StyleSheet.create({
  choice: { gap: space.xs },
  error: { color: colors.danger },
  checkbox: { flexDirection: 'row', gap: space.sm, alignItems: 'center', minHeight: touch.min },
  /** The tick box: filled when ticked, its border red when the field has an error. */
  box: {
    width: 26,
    height: 26,
    borderRadius: 4,
    borderWidth: 2,
    borderColor: colors.ink,
    alignItems: 'center',
    justifyContent: 'center',
    backgroundColor: colors.surface,
  },
  boxOn: { backgroundColor: colors.ink },
  boxError: { borderColor: colors.danger },
  tick: { color: '#fff', fontFamily: fonts.textBold },
  checkboxLabel: { flexShrink: 1 },
});
