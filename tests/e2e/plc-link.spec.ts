import { expect, test } from '@playwright/test';
import ModbusRTU from 'modbus-serial';
import { DEMO, signInAs } from './foundation-helpers';

/*
 * PLC link (issue 13): the demo trainer starts a link on the demo pick-and-place cell; a Modbus
 * TCP client in the test process plays the PLC. The page follows the link live: waiting,
 * linked with the written coil ON, link lost when the client goes silent, and stopped.
 * Port 15036 is this spec's (the integration tests use 15020–15039 in their own processes).
 */
const PORT = 15036;
const SHOTS = process.env.E2E_SHOTS_DIR;

test('a trainer starts a PLC link, a Modbus client drives it, the page shows link health and link loss', async ({ page }) => {
  test.setTimeout(60_000);
  await signInAs(page, DEMO.trainer);
  await page.goto('/plc-link');
  await expect(page.getByTestId('plc-link-caution')).toBeVisible();
  await page.getByRole('combobox', { name: 'Cell', exact: true }).selectOption({ label: 'Kestrel Vale Cell B — pick and place' });
  await page.getByLabel('Modbus TCP port').fill(String(PORT));
  await page.getByLabel('Link-loss timeout (ms)').fill('500');
  await page.getByRole('button', { name: 'Start PLC link' }).click();
  await page.waitForURL(/\/plc-link\/[0-9a-f-]{36}$/);
  await expect(page.getByTestId('plc-link-state')).toHaveText('Waiting for the PLC');
  await expect(page.getByTestId('plc-link-register-map').getByRole('row', { name: /%QX0\.0/ })).toContainText('Coil');

  const client = new ModbusRTU();
  await client.connectTCP('127.0.0.1', { port: PORT });
  client.setID(1);
  let polling = true;
  const poll = (async () => {
    while (polling) {
      await client.writeCoil(3, true); // guard pass-through, as the demo's sheet writes it
      await client.readDiscreteInputs(0, 16);
      await new Promise((r) => setTimeout(r, 50));
    }
  })();
  await expect(page.getByTestId('plc-link-state')).toHaveText('Linked');
  await expect(page.getByTestId('plc-link-register-map').getByRole('row', { name: /%QX0\.3/ })).toContainText('ON');
  await expect(page.getByTestId('plc-link-controller-state')).toHaveText('ready');
  if (SHOTS) await page.screenshot({ path: `${SHOTS}/plc-link-linked.png`, fullPage: true });

  polling = false;
  await poll;
  await expect(page.getByTestId('plc-link-state')).toHaveText('Link lost');
  await expect(page.getByTestId('plc-link-register-map').getByRole('row', { name: /%QX0\.3/ })).toContainText('off');
  if (SHOTS) await page.screenshot({ path: `${SHOTS}/plc-link-lost.png`, fullPage: true });

  await page.getByRole('button', { name: 'Stop' }).click();
  await expect(page.getByTestId('plc-link-state')).toHaveText('Stopped');
  client.close(() => {});
});
