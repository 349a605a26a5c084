import { Link } from 'expo-router';
import React, { useState } from 'react';
import { StyleSheet } from 'react-native';
import { passwordResetRequestSchema } from '../../shared/schemas/invitations';
import { useRequestPasswordReset } from '../../hooks/account';
import { serverErrors, useZodForm } from '../../hooks/forms';
import { colors, fonts } from '../theme';
import { FormTextField } from '../form';
import { Button, Notice, PublicPage, T } from '../ui';

/** Asks for a password-reset link. The answer never says whether the address has an account. */
export function ForgotPasswordScreen() {
  const request = useRequestPasswordReset();
  const form = useZodForm(passwordResetRequestSchema, { defaultValues: { email: '' } });
  const [message, setMessage] = useState<string | null>(null);
  const [sentTo, setSentTo] = useState<string | null>(null);

  const submit = () => {
    setMessage(null);
    void form.handleSubmit(({ email }) =>
      request.mutate(email, {
        onSuccess: () => setSentTo(email),
        onError: (e) => setMessage(serverErrors(e).message),
      }),
    )();
  };

  return (
    <PublicPage
      title="Forgot your password?"
      footer={
        <Link href="/sign-in" style={styles.backLink} testID="back-to-sign-in">
          Back to sign in
        </Link>
      }
    >
      {sentTo ? (
        <Notice tone="ok" title="Check your e-mail" testID="reset-requested">
          {`If an account exists for ${sentTo}, a link to set a new password is on its way. The link works for one hour and only once.`}
        </Notice>
      ) : (
        <>
          <T>Enter the e-mail address you sign in with. We will send a link to set a new password.</T>
          {message ? (
            <Notice tone="error" testID="reset-error">
              {message}
            </Notice>
          ) : null}
          <FormTextField
            control={form.control}
            name="email"
            label="E-mail"
            testID="reset-email"
            autoCapitalize="none"
            autoComplete="email"
            inputMode="email"
            onSubmitEditing={submit}
          />
          <Button title="Send the link" testID="reset-submit" busy={request.isPending} onPress={submit} />
        </>
      )}
    </PublicPage>
  );
}

const styles = StyleSheet.create({
  backLink: { color: colors.navInk, fontSize: 16, fontFamily: fonts.textMedium, textDecorationLine: 'underline' },
});
