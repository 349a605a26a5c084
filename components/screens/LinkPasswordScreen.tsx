import { Link, useRouter } from 'expo-router';
import React, { useState } from 'react';
import { StyleSheet } from 'react-native';
import { z } from 'zod';
import { passwordSchema } from '../../shared/schemas/auth';
import { ROLE_LABELS } from '../../shared/schemas/common';
import type { TokenInfo } from '../../shared/schemas/invitations';
import { useLinkInfo, useSetPasswordFromLink } from '../../hooks/account';
import { ApiClientError } from '../../hooks/api';
import { fmtDateTime } from '../../hooks/dates';
import { applyServerErrors, serverErrors, useZodForm } from '../../hooks/forms';
import { colors, fonts } from '../theme';
import { FormTextField } from '../form';
import { Button, Loading, Notice, PublicPage, T } from '../ui';

const COPY = {
  invitation: {
    title: 'Welcome to Emberline',
    action: 'Set your password and sign in',
    gone: 'This invitation link has expired or has already been used.',
    forward: 'Ask your administrator to send a new invitation. If you already set your password, sign in.',
  },
  'password-reset': {
    title: 'Set a new password',
    action: 'Set the new password',
    gone: 'This password link has expired or has already been used.',
    forward: 'Ask for a new link: it works for one hour, once.',
  },
} as const;

/** The new password, typed twice: the second is compared once the first is acceptable. */
const newPasswordForm = z
  .object({ password: passwordSchema, confirm: z.string() })
  .refine((f) => f.confirm === f.password, {
    path: ['confirm'],
    message: 'The two passwords differ',
    when: ({ value }) => passwordSchema.safeParse((value as { password?: unknown }).password).success,
  });

/** A one-time link from an e-mail (invitation or password reset): whose it is, then a new password, then home. */
export function LinkPasswordScreen({ token, purpose }: { token: string; purpose: TokenInfo['purpose'] }) {
  const router = useRouter();
  const info = useLinkInfo(token);
  const setPassword = useSetPasswordFromLink(purpose);
  const form = useZodForm(newPasswordForm, { defaultValues: { password: '', confirm: '' } });
  const [message, setMessage] = useState<string | null>(null);
  const copy = COPY[purpose];

  const gone =
    (info.error instanceof ApiClientError &&
      (info.error.status === 404 || info.error.status === 400 || info.error.status === 410)) ||
    (!!info.data && info.data.purpose !== purpose);

  // A message stays until the field it is about changes (a new first password makes the comparison moot too).
  const changePassword = () => form.clearErrors();
  const changeConfirm = () => form.clearErrors('confirm');

  const submit = () => {
    setMessage(null);
    void form.handleSubmit(({ password }) =>
      setPassword.mutate(
        { token, password },
        {
          onSuccess: () => router.replace('/'),
          onError: (e) => setMessage(applyServerErrors(form, e)),
        },
      ),
    )();
  };

  const forward = (
    <Link
      href={purpose === 'password-reset' ? '/forgot-password' : '/sign-in'}
      style={styles.forwardLink}
      testID="link-forward"
    >
      {purpose === 'password-reset' ? 'Ask for a new link →' : 'Go to sign in →'}
    </Link>
  );

  return (
    <PublicPage
      title={gone ? 'This link no longer works' : copy.title}
      footer={
        <Link href="/sign-in" style={styles.backLink}>
          Back to sign in
        </Link>
      }
    >
      {info.isLoading ? <Loading what="Checking the link…" /> : null}
      {gone ? (
        <>
          <Notice tone="warning" testID="link-gone">
            {`${copy.gone} ${copy.forward}`}
          </Notice>
          {forward}
        </>
      ) : null}
      {info.error && !gone ? <Notice tone="error">{serverErrors(info.error).message}</Notice> : null}
      {info.data && !gone ? (
        <>
          <T testID="link-info">
            {purpose === 'invitation'
              ? `${info.data.name}, you are invited to join ${info.data.organizationName || 'your organization'} on Emberline${info.data.role ? ` as ${ROLE_LABELS[info.data.role].toLowerCase()}` : ''}. You will sign in as ${info.data.email}: choose a password to finish.`
              : `Choose a new password for ${info.data.email} (${info.data.name}). Other devices will be signed out.`}
          </T>
          <T variant="small">The link works until {fmtDateTime(info.data.expiresAt)}, once.</T>
          {message ? (
            <Notice tone="error" testID="link-error">
              {message}
            </Notice>
          ) : null}
          <FormTextField
            control={form.control}
            name="password"
            label="New password"
            testID="link-password"
            onChangeText={changePassword}
            secureTextEntry
            autoComplete="new-password"
            hint="At least 10 characters"
          />
          <FormTextField
            control={form.control}
            name="confirm"
            label="New password again"
            testID="link-confirm"
            onChangeText={changeConfirm}
            secureTextEntry
            autoComplete="new-password"
            onSubmitEditing={submit}
          />
          <Button title={copy.action} testID="link-submit" busy={setPassword.isPending} onPress={submit} />
        </>
      ) : null}
    </PublicPage>
  );
}

const styles = StyleSheet.create({
  forwardLink: { color: colors.accent, fontSize: 16, fontFamily: fonts.textMedium },
  backLink: { color: colors.navInk, fontSize: 16, fontFamily: fonts.textMedium, textDecorationLine: 'underline' },
});
