import type { Harness, Spec } from '../harness';
import { DESKTOP, PHONE, pollUntil, assert } from '../harness';

export const specs: Spec[] = [
  ...(
    [
      ['phone', PHONE],
      ['desktop', DESKTOP],
    ] as const
  ).map(([label, viewport]) => ({
    name: `engineer runs a spot check with a preset (${label})`,
    run: async (h: Harness) => {
      const page = await h.newPage(viewport);
      await h.signIn(page, 'engineer@larkspur.example');
      await page.getByTestId('home-engineer').waitFor();
      await page.goto(`${h.baseUrl}/spot-check`);
      await page.getByTestId('preset-switchgear-lv').click();
      await page.getByTestId('boltedFaultKa').fill('35');
      await page.getByTestId('duration-mode-two').click();
      await page.getByTestId('fullMs').fill('80');
      await page.getByTestId('reducedMs').fill('400');
      await page.getByTestId('calculate').click();
      await page.getByTestId('energy-result').waitFor();
      const energy = await page.getByTestId('energy-cal').innerText();
      assert(/\d/.test(energy), `energy shown (${energy})`);
      await page.getByTestId('cautions').waitFor();
      await page.getByTestId('case-reduced').getByText('GOVERNS').waitFor();
      await h.shot(page, `spot-check-${label}`);
      await page.close();
    },
  })),
  {
    name: 'spot check: switching mm → in → mm keeps every length and the result; a failed Calculate clears the result (phone)',
    run: async (h) => {
      const page = await h.newPage(PHONE);
      await h.signIn(page, 'engineer@larkspur.example');
      await page.getByTestId('home-engineer').waitFor();
      await page.goto(`${h.baseUrl}/spot-check`);
      await page.getByTestId('unit-si').click();
      await page.getByTestId('gap').fill('32');
      await page.getByTestId('calculate').click();
      await page.getByTestId('energy-result').waitFor();
      const before = await page.getByTestId('energy-cal').innerText();
      // 32 mm shows as 1.26 in (rounded for reading only) and comes back as 32 mm, not 32.004 or 33.
      await page.getByTestId('unit-us').click();
      assert((await page.getByTestId('gap').inputValue()) === '1.26', 'gap shown in inches');
      await page.getByTestId('calculate').click();
      await page.getByTestId('energy-result').waitFor();
      const inInches = await page.getByTestId('energy-cal').innerText();
      await page.getByTestId('unit-si').click();
      assert((await page.getByTestId('gap').inputValue()) === '32', 'gap back to 32 mm');
      await page.getByTestId('calculate').click();
      await page.getByTestId('energy-result').waitFor();
      const after = await page.getByTestId('energy-cal').innerText();
      assert(before === inInches && before === after, `same result in both units (${before}, ${inInches}, ${after})`);
      // A Calculate that fails leaves no result beside the error.
      await page.getByTestId('boltedFaultKa').fill('');
      await page.getByTestId('calculate').click();
      await page.getByText('Enter a number').first().waitFor();
      await pollUntil(async () => (await page.getByTestId('energy-result').count()) === 0, 'the old result cleared');
      await h.shot(page, 'spot-check-units-phone');
      await page.close();
    },
  },
  {
    name: 'spot check names a bad field and refuses an out-of-range voltage (phone)',
    run: async (h) => {
      const page = await h.newPage(PHONE);
      await h.signIn(page, 'engineer@larkspur.example');
      await page.getByTestId('home-engineer').waitFor();
      await page.goto(`${h.baseUrl}/spot-check`);
      await page.getByTestId('boltedFaultKa').fill('');
      await page.getByTestId('calculate').click();
      await page.getByText('Enter a number').first().waitFor();
      await page.getByTestId('boltedFaultKa').fill('20');
      await page.getByTestId('voltageV').fill('34500');
      await page.getByTestId('calculate').click();
      const err = page.getByTestId('spot-error');
      await err.waitFor();
      assert((await err.innerText()).toLowerCase().includes('model'), 'says the model does not apply');
      await h.shot(page, 'spot-check-error-phone');
      await page.close();
    },
  },
  ...(
    [
      ['phone', PHONE],
      ['desktop', DESKTOP],
    ] as const
  ).map(([label, viewport]) => ({
    name: `engineer opens the trip unit, changes a switch and reads the band (${label})`,
    run: async (h: Harness) => {
      const page = await h.newPage(viewport);
      await h.signIn(page, 'engineer@larkspur.example');
      await page.getByTestId('home-engineer').waitFor();
      await page.goto(`${h.baseUrl}/devices`);
      // The library holds the whole generic starter set: narrow it to the electronic trip units first.
      await page.getByTestId('kind-filter-electronic').click();
      await page.getByTestId('device-Generic LSIG trip unit, 1600 A frame').click();
      await page.getByTestId('tcc').waitFor();
      await page.getByTestId('pos-instantaneousPickup-OFF').click();
      await page.getByTestId('read-current').fill('12000');
      await page.getByTestId('read-band').click();
      const reading = page.getByTestId('band-reading');
      await reading.waitFor();
      const text = await reading.innerText();
      assert(text.includes('short-time'), `short-time region with instantaneous OFF (${text})`);
      await h.shot(page, `device-electronic-${label}`);
      await page.close();
    },
  })),
  {
    name: 'engineer uploads a digitized band CSV and saves it (desktop)',
    run: async (h) => {
      const page = await h.newPage(DESKTOP);
      await h.signIn(page, 'engineer@larkspur.example');
      await page.getByTestId('home-engineer').waitFor();
      await page.goto(`${h.baseUrl}/devices`);
      await page.getByTestId('new-device').click();
      await page.getByTestId('new-band').click();
      await page.getByTestId('device-name').fill('Feeder breaker, read off published curve');
      await page.locator('input[type=file]').setInputFiles({
        name: 'bad.csv',
        mimeType: 'text/csv',
        buffer: Buffer.from('multiple,min_s,max_s\n2,50,100\n5,x,12\n'),
      });
      await page.getByText('line 3').first().waitFor();
      const band = Buffer.from('multiple,min_s,max_s\n1.5,300,1500\n3,30,150\n6,4,20\n10,0.8,5\n20,0.02,0.06\n');
      // The unit of the first column is chosen before the upload: a header saying otherwise is refused.
      await page.getByTestId('csv-unit-ampere').click();
      await page.locator('input[type=file]').setInputFiles({ name: 'band.csv', mimeType: 'text/csv', buffer: band });
      await page.getByText('header says the first column holds multiples', { exact: false }).first().waitFor();
      await page.getByTestId('csv-unit-multiple').click();
      await page.locator('input[type=file]').setInputFiles({ name: 'band2.csv', mimeType: 'text/csv', buffer: band });
      await page.getByText('Read 5 maximum').waitFor();
      await page.getByText('the first column in multiples of the rating', { exact: false }).waitFor();
      await page.getByTestId('save-device').click();
      await page.getByText('Saved to the device library.').waitFor();
      await h.shot(page, 'device-band-desktop');
      await page.close();
    },
  },
  {
    name: 'electrician sees the device library read-only (phone)',
    run: async (h) => {
      const page = await h.newPage(PHONE);
      await h.signIn(page, 'electrician@larkspur.example');
      await page.getByTestId('home-electrician').waitFor();
      await page.goto(`${h.baseUrl}/devices`);
      await page.getByTestId('device-Feeder relay, very inverse').click();
      await page.getByTestId('tcc').waitFor();
      assert((await page.getByTestId('save-device').count()) === 0, 'no save button');
      await h.shot(page, 'device-relay-electrician-phone');
      await page.close();
    },
  },
];
