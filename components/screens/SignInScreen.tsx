import { Link, Redirect } from 'expo-router';
import React, { useState } from 'react';
import { KeyboardAvoidingView, ScrollView, StyleSheet, View } from 'react-native';
import { signInRequestSchema } from '../../shared/schemas/auth';
import { applyServerErrors, useZodForm } from '../../hooks/forms';
import { useSession } from '../../hooks/session';
import { colors, fonts, radius, space } from '../theme';
import { FormTextField } from '../form';
import { Button, Notice, T } from '../ui';

export function SignInScreen() {
  const { user, signIn } = useSession();
  const form = useZodForm(signInRequestSchema, { defaultValues: { email: '', password: '' } });
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  if (user) return <Redirect href="/" />;

  const submit = () => {
    setMessage(null);
    void form.handleSubmit(async (data) => {
      setBusy(true);
      try {
        await signIn(data.email, data.password);
      } catch (e) {
        setMessage(applyServerErrors(form, e));
      } finally {
        setBusy(false);
      }
    })();
  };

  return (
    <KeyboardAvoidingView style={styles.page}>
      <ScrollView contentContainerStyle={styles.pageContent}>
        <View style={styles.column}>
          <View style={styles.brand}>
            <View style={styles.wordmark}>
              <View style={styles.mark} />
              <T style={styles.appName}>Emberline</T>
            </View>
            <T style={styles.tagline}>Arc-flash studies, clearing times and equipment labels.</T>
          </View>
          <View style={styles.form}>
            <T variant="heading" accessibilityRole="header">
              Sign in
            </T>
            {message ? (
              <Notice tone="error" testID="sign-in-error">
                {message}
              </Notice>
            ) : null}
            <FormTextField
              control={form.control}
              name="email"
              label="E-mail"
              testID="email"
              autoCapitalize="none"
              autoComplete="email"
              inputMode="email"
            />
            <FormTextField
              control={form.control}
              name="password"
              label="Password"
              testID="password"
              secureTextEntry
              autoComplete="current-password"
              onSubmitEditing={submit}
            />
            <Button title="Sign in" testID="sign-in-submit" busy={busy} onPress={submit} />
            <Link href="/forgot-password" style={styles.forgotLink} testID="forgot-password">
              Forgot your password?
            </Link>
          </View>
          <T variant="small" style={styles.footer}>
            Results in Emberline come from a model and are not final until a qualified, licensed engineer approves them.
          </T>
        </View>
      </ScrollView>
    </KeyboardAvoidingView>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, backgroundColor: colors.nav },
  pageContent: { flexGrow: 1, justifyContent: 'center', padding: space.lg },
  column: { width: '100%', maxWidth: 420, alignSelf: 'center', gap: space.xl },
  brand: { gap: space.sm },
  wordmark: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  mark: { width: 14, height: 34, borderRadius: 7, backgroundColor: colors.accent },
  appName: { fontFamily: fonts.textBold, fontSize: 30, color: colors.navInk },
  tagline: { color: colors.navMuted },
  form: { backgroundColor: colors.surface, borderRadius: radius.lg, padding: space.xl, gap: space.lg },
  forgotLink: {
    color: colors.accent,
    fontSize: 15,
    fontFamily: fonts.textMedium,
    alignSelf: 'center',
    paddingVertical: space.xs,
  },
  footer: { color: colors.navMuted },
});
