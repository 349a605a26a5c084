import { Link, useRouter } from 'expo-router';
import React, { useState } from 'react';
import { passwordSchema } from '../../shared/schemas/auth';
import { ROLE_LABELS } from '../../shared/schemas/common';
import type { TokenInfo } from '../../shared/schemas/invitations';
import { useLinkInfo, useSetPasswordFromLink } from '../../hooks/account';
import { ApiClientError } from '../../hooks/api';
import { fmtDateTime } from '../../hooks/dates';
import { serverErrors } from '../../hooks/forms';
import { colors, fonts } from '../theme';
import { Button, Field, Loading, Notice, PublicPage, T } from '../ui';

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

/** A one-time link from an e-mail (invitation or password reset): whose it is, then a new password, then home. */
export function LinkPasswordScreen({ token, purpose }: { token: string; purpose: TokenInfo['purpose'] }) {
  const router = useRouter();
  const info = useLinkInfo(token);
  const setPassword = useSetPasswordFromLink(purpose);
  const [password, setPasswordValue] = useState('');
  const [confirm, setConfirm] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string | null>(null);
  const copy = COPY[purpose];

  const gone =
    (info.error instanceof ApiClientError &&
      (info.error.status === 404 || info.error.status === 400 || info.error.status === 410)) ||
    (!!info.data && info.data.purpose !== purpose);

  // A message stays until the field it is about changes.
  const changePassword = (v: string) => {
    setPasswordValue(v);
    setErrors({});
  };
  const changeConfirm = (v: string) => {
    setConfirm(v);
    setErrors((e) => ({ ...e, confirm: '' }));
  };

  const submit = () => {
    setMessage(null);
    const p = passwordSchema.safeParse(password);
    const errs: Record<string, string> = {};
    if (!p.success) errs.password = p.error.issues[0]?.message ?? 'Choose another password';
    else if (confirm !== password) errs.confirm = 'The two passwords differ';
    setErrors(errs);
    if (Object.keys(errs).length) return;
    setPassword.mutate(
      { token, password },
      {
        onSuccess: () => router.replace('/'),
        onError: (e) => {
          const s = serverErrors(e);
          setMessage(s.message);
          setErrors(s.fields);
        },
      },
    );
  };

  const forward = (
    <Link
      href={purpose === 'password-reset' ? '/forgot-password' : '/sign-in'}
      style={{ color: colors.accent, fontSize: 16, fontFamily: fonts.textMedium }}
      testID="link-forward"
    >
      {purpose === 'password-reset' ? 'Ask for a new link →' : 'Go to sign in →'}
    </Link>
  );

  return (
    <PublicPage
      title={gone ? 'This link no longer works' : copy.title}
      footer={
        <Link
          href="/sign-in"
          style={{ color: colors.navInk, fontSize: 16, fontFamily: fonts.textMedium, textDecorationLine: 'underline' }}
        >
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
          <Field
            label="New password"
            testID="link-password"
            value={password}
            onChangeText={changePassword}
            secureTextEntry
            autoComplete="new-password"
            error={errors.password}
            hint="At least 10 characters"
          />
          <Field
            label="New password again"
            testID="link-confirm"
            value={confirm}
            onChangeText={changeConfirm}
            secureTextEntry
            autoComplete="new-password"
            error={errors.confirm}
            onSubmitEditing={submit}
          />
          <Button title={copy.action} testID="link-submit" busy={setPassword.isPending} onPress={submit} />
        </>
      ) : null}
    </PublicPage>
  );
}
