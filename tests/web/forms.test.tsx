/**
 * The form layer (hooks/forms.ts, components/form): a shared zod schema checks the fields on submit (react-hook-form's
 * zod resolver), each message lands under its field, and a server's 4xx field errors (`fields` of an ApiError, keys
 * like `ppeLevels[1].name`) go under the same fields.
 */
import React from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { useForm, type FieldValues, type ResolverOptions } from 'react-hook-form';
import { z } from 'zod';
import { FormChoice, FormTextField } from '../../components/form';
import { ApiClientError } from '../../hooks/api';
import { applyServerErrors, errorMessage, formFieldName, ownErrorMessage, zodFormResolver } from '../../hooks/forms';
import { organizationSettingsSchema } from '../../shared/schemas/organization';
import { signInRequestSchema } from '../../shared/schemas/auth';

const opts = (names: string[]) =>
  ({ fields: {}, names, shouldUseNativeValidation: false, criteriaMode: 'firstError' }) as ResolverOptions<FieldValues>;

const text = (html: string) =>
  html
    .replace(/<[^>]*>/g, ' ')
    .replace(/&#x27;|&#39;/g, "'")
    .replace(/\s+/g, ' ');

describe('zodFormResolver', () => {
  it('gives the schema’s first message per field, and the parsed output when the values pass', async () => {
    const resolve = zodFormResolver(signInRequestSchema);
    const bad = await resolve({ email: 'not an address', password: '' }, undefined, opts(['email', 'password']));
    expect(errorMessage(bad.errors.email)).toBe('Enter a valid e-mail address');
    expect(errorMessage(bad.errors.password)).toBe('Enter your password');
    const good = await resolve({ email: '  Sam@Example.NET ', password: 'x' }, undefined, opts(['email', 'password']));
    expect(good.errors).toEqual({});
    // The schema's output (trimmed, lower case), not the text as typed.
    expect(good.values).toEqual({ email: 'sam@example.net', password: 'x' });
  });

  it('checks text fields as the schema’s numbers through toInput, messages under the text fields', async () => {
    type Form = { months: string; danger: string };
    const schema = z.object({ months: z.number().int().min(1, 'At least 1 month'), danger: z.number().positive() });
    const resolve = zodFormResolver<typeof schema, Form>(schema, (f) => ({
      months: Number(f.months),
      danger: Number(f.danger),
    }));
    const r = await resolve({ months: '0', danger: '40' }, undefined, opts(['months', 'danger']));
    expect(errorMessage(r.errors.months)).toBe('At least 1 month');
    expect(r.errors.danger).toBeUndefined();
    const ok = await resolve({ months: '60', danger: '40' }, undefined, opts(['months', 'danger']));
    expect(ok.values).toEqual({ months: 60, danger: 40 });
  });

  it('rewords a message where the text says more than the schema can (text that is not a whole number)', async () => {
    type Form = { days: string };
    const schema = z.object({ days: z.number().int('Whole days').min(1).max(365) });
    const resolve = zodFormResolver<typeof schema, Form>(
      schema,
      (f) => ({ days: Number(f.days) }),
      (errors, f) => {
        if (errors.days && !/^\d+$/.test(f.days)) errors.days = { type: 'whole', message: 'Enter whole days' };
      },
    );
    expect(errorMessage((await resolve({ days: '12.5' }, undefined, opts(['days']))).errors.days)).toBe(
      'Enter whole days',
    );
    // A whole number out of range keeps the schema's own message.
    expect(errorMessage((await resolve({ days: '400' }, undefined, opts(['days']))).errors.days)).not.toBe(
      'Enter whole days',
    );
    expect((await resolve({ days: '12' }, undefined, opts(['days']))).errors).toEqual({});
  });

  it('puts an item’s message under the item (ppeLevels.1.maxCalPerCm2) and a list’s own message on the list', async () => {
    const settings = organizationSettingsSchema.parse({});
    const resolve = zodFormResolver(organizationSettingsSchema);
    const levels = [
      { name: 'Level A', maxCalPerCm2: 8 },
      { name: 'Level B', maxCalPerCm2: -1 },
    ];
    const r = await resolve({ ...settings, ppeLevels: levels }, undefined, opts(['ppeLevels']));
    const items = r.errors.ppeLevels as unknown as Record<string, unknown>;
    expect(errorMessage(items[1])).toBeTruthy();
    expect(items[0]).toBeUndefined();
    expect(ownErrorMessage(r.errors.ppeLevels)).toBeUndefined();
    const none = await resolve({ ...settings, ppeLevels: [] }, undefined, opts(['ppeLevels']));
    expect(ownErrorMessage(none.errors.ppeLevels)).toBe('Keep at least one level');
  });
});

describe('server errors', () => {
  it('maps an ApiError’s field keys onto the form’s names and returns its message', () => {
    expect(formFieldName('ppeLevels[2].name')).toBe('ppeLevels.2.name');
    expect(formFieldName('email')).toBe('email');
    const set: [string, string | undefined][] = [];
    const message = applyServerErrors(
      { setError: (name: string, e: { message?: string }) => void set.push([name, e.message]) },
      new ApiClientError(400, 'bad_request', 'The e-mail is in use', {
        email: 'Already in use',
        'levels[1].max': 'Too low',
      }),
    );
    expect(message).toBe('The e-mail is in use');
    expect(set).toEqual([
      ['email', 'Already in use'],
      ['levels.1.max', 'Too low'],
    ]);
  });

  it('a list’s own message is read from the list or its root, not from its items', () => {
    expect(ownErrorMessage({ message: 'In ascending order' })).toBe('In ascending order');
    expect(ownErrorMessage({ root: { message: 'In ascending order' } })).toBe('In ascending order');
    expect(ownErrorMessage([undefined, { name: { message: 'Enter a name' } }])).toBeUndefined();
  });
});

describe('form fields', () => {
  function Form({ errors }: { errors?: Record<string, { type: string; message: string }> }) {
    const form = useForm<{ email: string; role: 'engineer' | 'admin' }>({
      defaultValues: { email: 'sam@', role: 'engineer' },
      errors,
    });
    return (
      <>
        <FormTextField control={form.control} name="email" label="E-mail" testID="email" />
        <FormChoice
          control={form.control}
          name="role"
          label="Role"
          testID="role"
          options={[
            { value: 'engineer', label: 'Engineer' },
            { value: 'admin', label: 'Admin' },
          ]}
        />
      </>
    );
  }

  it('shows the label, the value, and each field’s message under it as an alert', () => {
    const html = renderToStaticMarkup(
      <Form
        errors={{
          email: { type: 'server', message: 'Already in use' },
          role: { type: 'server', message: 'Choose a role' },
        }}
      />,
    );
    expect(html).toContain('aria-label="E-mail"');
    expect(html).toContain('value="sam@"');
    expect(html).toContain('data-testid="email"');
    expect(html).toContain('data-testid="role-engineer"');
    // Each message follows its own field.
    const t = text(html);
    expect(t.indexOf('E-mail')).toBeLessThan(t.indexOf('Already in use'));
    expect(t.indexOf('Already in use')).toBeLessThan(t.indexOf('Role'));
    expect(t.indexOf('Role')).toBeLessThan(t.indexOf('Choose a role'));
    expect(html.match(/role="alert"/g)?.length).toBe(2);
  });

  it('shows no message when the form has no errors', () => {
    const html = renderToStaticMarkup(<Form />);
    expect(html).not.toContain('role="alert"');
    expect(text(html)).not.toContain('Already in use');
  });
});
