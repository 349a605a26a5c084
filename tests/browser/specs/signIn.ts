import type { Harness, Spec } from '../harness';
import { clearLocalStorage, DESKTOP, PHONE, assert } from '../harness';

const ROLES = ['engineer', 'electrician', 'safety', 'admin'] as const;

export const specs: Spec[] = [
  ...ROLES.flatMap((role) =>
    (
      [
        ['phone', PHONE],
        ['desktop', DESKTOP],
      ] as const
    ).map(([label, viewport]) => ({
      name: `${role} signs in and sees the ${role} home (${label})`,
      run: async (h: Harness) => {
        const page = await h.newPage(viewport);
        await h.signIn(page, `${role}@larkspur.example`);
        await page.getByTestId(`home-${role}`).waitFor();
        // Phone: bottom tabs; desktop: side navigation.
        await page.getByTestId(label === 'phone' ? 'bottom-tabs' : 'side-nav').waitFor();
        await h.shot(page, `home-${role}-${label}`);
        // The session survives a reload.
        await page.reload();
        await page.getByTestId(`home-${role}`).waitFor();
        await page.close();
      },
    })),
  ),
  {
    name: 'role guard: an electrician sees the audit log is not available for the role, an engineer sees the log (phone)',
    run: async (h) => {
      const page = await h.newPage(PHONE);
      await h.signIn(page, 'electrician@larkspur.example');
      await page.getByTestId('home-electrician').waitFor();
      // The menu does not offer it…
      await page.goto(`${h.baseUrl}/more`);
      await page.getByRole('link', { name: 'Account' }).first().waitFor();
      assert((await page.getByRole('link', { name: 'Audit log' }).count()) === 0, 'no audit log in the menu');
      // …and the address says why instead of showing it.
      await page.goto(`${h.baseUrl}/audit-log`);
      const denied = page.getByTestId('role-guard-denied');
      await denied.waitFor();
      const why = await denied.innerText();
      assert(why.includes('The audit log is for administrators, engineers and safety officers.'), `says who: ${why}`);
      assert(why.includes('signed in as electrician'), `says the role: ${why}`);
      assert((await page.getByTestId('audit-search').count()) === 0, 'the log is not shown');
      await h.shot(page, 'role-guard-electrician-phone');
      await page.getByTestId('role-guard-home').click();
      await page.getByTestId('home-electrician').waitFor();

      await h.signIn(page, 'engineer@larkspur.example');
      await page.getByTestId('home-engineer').waitFor();
      await page.goto(`${h.baseUrl}/audit-log`);
      await page.getByTestId('audit-search').waitFor();
      assert((await page.getByTestId('role-guard-denied').count()) === 0, 'the engineer is not refused');
      await h.shot(page, 'role-guard-engineer-phone');
      await page.close();
    },
  },
  {
    name: 'a wrong password shows the error and stays on sign-in (phone)',
    run: async (h) => {
      const page = await h.newPage(PHONE);
      await page.goto(`${h.baseUrl}/sign-in`);
      await clearLocalStorage(page);
      await page.goto(`${h.baseUrl}/sign-in`);
      await page.getByTestId('email').fill('engineer@larkspur.example');
      await page.getByTestId('password').fill('wrong-password');
      await page.getByTestId('sign-in-submit').click();
      const error = page.getByTestId('sign-in-error');
      await error.waitFor();
      assert((await error.innerText()).includes('not right'), 'error message shown');
      await h.shot(page, 'sign-in-error-phone');
      await page.close();
    },
  },
  {
    name: 'a guarded page redirects to sign-in when signed out (desktop)',
    run: async (h) => {
      const page = await h.context.newPage();
      await page.goto(`${h.baseUrl}/sites`);
      await clearLocalStorage(page);
      await page.goto(`${h.baseUrl}/sites`);
      await page.getByTestId('sign-in-submit').waitFor();
      await h.shot(page, 'sign-in-desktop');
      await page.close();
    },
  },
];
