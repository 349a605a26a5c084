import type { Spec } from '../harness';
import { DESKTOP, pollUntil } from '../harness';

export const specs: Spec[] = [
  {
    name: 'reminder address outside the organization: pending for the safety officer, approved by the admin (desktop)',
    run: async (h) => {
      const page = await h.newPage(DESKTOP);
      await h.signIn(page, 'safety@larkspur.example');
      await page.getByTestId('home-safety').waitFor();
      await page.goto(`${h.baseUrl}/reminders`);
      await page.getByTestId('rule-new').click();
      await page.getByTestId('rule-name').fill('Outside auditor');
      await page.getByTestId('rule-emails').fill('auditor@outside-firm.example');
      await page.getByTestId('rule-save').click();
      const pending = page.getByTestId('rule-pending-Outside auditor');
      await pending.getByText(/auditor@outside-firm\.example/).waitFor();
      // The safety officer sees the state but has no Approve button.
      if (await page.getByTestId('rule-approve-Outside auditor').count())
        throw new Error('the safety officer must not see the Approve button');
      await page.close();

      const admin = await h.newPage(DESKTOP);
      await h.signIn(admin, 'admin@larkspur.example');
      await admin.getByTestId('home-admin').waitFor();
      await admin.goto(`${h.baseUrl}/reminders`);
      await admin.getByTestId('rule-approve-Outside auditor').click();
      await pollUntil(
        async () => (await admin.getByTestId('rule-pending-Outside auditor').count()) === 0,
        'the pending notice to go once approved',
      );
      await admin
        .getByTestId('rule-Outside auditor')
        .getByText(/auditor@outside-firm\.example/)
        .waitFor();
      await h.shot(admin, 'reminders-approved-desktop');
      await admin.close();
    },
  },
];
