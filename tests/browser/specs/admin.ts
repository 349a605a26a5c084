import type { Spec } from '../harness';
import { DESKTOP, PHONE } from '../harness';

export const specs: Spec[] = [
  {
    name: 'admin adds a person and deactivates them (desktop)',
    run: async (h) => {
      const page = await h.newPage(DESKTOP);
      await h.signIn(page, 'admin@larkspur.example');
      await page.getByTestId('home-admin').waitFor();
      await page.goto(`${h.baseUrl}/team`);
      await page.getByTestId('add-user').click();
      await page.getByTestId('user-name').fill('Temporary Contractor');
      await page.getByTestId('user-email').fill('contractor@larkspur.example');
      await page.getByTestId('user-password').fill('contractor-pass-1');
      await page.getByTestId('user-role-electrician').click();
      await page.getByTestId('user-create').click();
      await page.getByTestId('user-contractor@larkspur.example').waitFor();
      await page.getByTestId('toggle-contractor@larkspur.example').click();
      await page.getByTestId('user-contractor@larkspur.example').getByText('Deactivated').waitFor();
      await h.shot(page, 'team-desktop');
      await page.close();
    },
  },
  {
    name: 'engineer creates a site and opens it (phone)',
    run: async (h) => {
      const page = await h.newPage(PHONE);
      await h.signIn(page, 'engineer@larkspur.example');
      await page.getByTestId('home-engineer').waitFor();
      await page.goto(`${h.baseUrl}/sites`);
      await page.getByText('Larkspur Valley Water Reclamation Facility').first().waitFor();
      await page.getByTestId('new-site').click();
      await page.getByTestId('site-save').click();
      await page.getByText('Enter a site name').waitFor();
      await page.getByTestId('site-name').fill('Outfall pump station');
      await page.getByTestId('site-save').click();
      await page.getByRole('heading', { name: 'Outfall pump station' }).waitFor();
      await h.shot(page, 'site-phone');
      await page.close();
    },
  },
];
