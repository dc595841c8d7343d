import { answerDesign } from '@thermargin/core/sizing/calculator';
import { compareDrivetrains } from '@thermargin/core/sizing/drivetrain-compare';
import { median } from '@thermargin/core/stats/quantile';
import { DESIGN_NOTE, safetyCaution } from '@thermargin/shared/safety';
import type { CalculatorResponse, SizingResponse } from '@thermargin/shared/sizing-api';
import { marginStepsWords } from '@thermargin/shared/sizing-text';
import type { Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { num } from '../../web/src/format.ts';
import { calculatorBody, defaultForm } from '../../web/src/state/calculator.ts';
import { startWebStack, TOKENS, type WebStack } from '../support/web-stack.ts';
import { type Browser, launchBrowser, screenshot, signedIn } from './browser.ts';

let stack: WebStack;
let browser: Browser;
let sizing: SizingResponse['sizing'];

// biome-ignore lint/performance/useDomNodeTextContent: the visible text is what is checked
const text = (page: Page, selector: string) => page.locator(selector).first().innerText();
const chartData = (page: Page, id: string) =>
  page.evaluate((id) => window.__thermargin?.charts[id]?.data.map((c) => Array.from(c)) ?? null, id);
const post = async (body: unknown): Promise<CalculatorResponse> => {
  const res = await fetch(`${stack.url}/api/sizing/calculator`, {
    method: 'POST',
    headers: { authorization: `Bearer ${TOKENS.viewer}`, 'content-type': 'application/json' },
    body: JSON.stringify(body),
  });
  expect(res.status).toBe(200);
  return (await res.json()) as CalculatorResponse;
};

beforeAll(async () => {
  stack = await startWebStack({ vehicles: 4, days: 21, seed: 2 });
  const res = await fetch(`${stack.url}/api/sizing`, {
    headers: { authorization: `Bearer ${TOKENS.viewer}` },
  });
  sizing = ((await res.json()) as SizingResponse).sizing;
  browser = await launchBrowser();
}, 180_000);
// Any console error on any page fails the test that caused it.
afterEach(() => {
  expect(browser.consoleErrors()).toEqual([]);
});
afterAll(async () => {
  await browser?.close();
  await stack?.close();
});

describe('sizing sheet in a real browser against the running API', () => {
  it('shows the fleet figures: field k against the bench, the duty cycle, fouling and derates', async () => {
    const page = await signedIn(browser.context, stack.url, TOKENS.viewer);
    await page.getByRole('link', { name: 'Sizing sheet' }).click();
    await page.locator('[data-screen="sizing"] [data-chart="sizing-duty-speed"] canvas').waitFor();
    expect(await page.getByRole('link', { name: 'Sizing sheet' }).getAttribute('aria-current')).toBe('page');
    expect(await page.locator('[data-table="field-k"] tbody tr').count()).toBe(
      2 * sizing.vehicles.length + 2,
    );
    const v = sizing.vehicles[0]!;
    const ram = v.field_k.find((k) => k.band === 'ram')!;
    expect(
      await text(
        page,
        `[data-table="field-k"] tr[data-vehicle="${v.id}"][data-band="ram"] [data-col="ratio"]`,
      ),
    ).toContain(num(ram.ratio, '', 3));
    const duty = sizing.fleet.duty_cycle!;
    const keys = Object.keys(duty.overall.heat_kw!);
    expect(await chartData(page, 'sizing-duty-speed')).toEqual([
      duty.by_speed.map((_, i) => i),
      ...keys.map((k) => duty.by_speed.map((b) => b.heat_kw?.[k] ?? null)),
      duty.by_speed.map((b) => b.hours),
    ]);
    expect((await chartData(page, 'sizing-duty-ambient'))![0]).toHaveLength(duty.by_ambient.length);
    expect(await text(page, '[data-table="derates"] tr[data-vehicle="fleet"] [data-col="events"]')).toBe(
      String(sizing.fleet.derate!.events),
    );
    expect(await page.locator('[data-table="fouling"] tbody tr').count()).toBe(2 * (sizing.types.length + 1));
    // Each design check beside the margin analyze reports, and the steps between them named.
    for (const x of sizing.vehicles) {
      const row = `[data-table="design-checks"] tr[data-vehicle="${x.id}"]`;
      expect(await text(page, `${row} [data-col="now"]`)).toBe(num(x.design_check?.margin_now_pct, '%'));
      if (x.design_check)
        expect(await text(page, `${row} [data-col="steps"]`)).toContain(marginStepsWords(x.design_check));
    }
    // Cleaning intervals lead to work on a vehicle: the caution sits beside them.
    expect(await page.locator('[aria-labelledby="fouling"] .caution p').allInnerTexts()).toEqual(
      safetyCaution(sizing.vehicles.map((v) => v.powertrain)).split('\n'),
    );
    // The design-side note sits above the figures.
    expect(await text(page, '.design-note')).toBe(DESIGN_NOTE);
    await page.close();
  });

  it('the calculator answers as core does, and the answer follows the inputs', async () => {
    const page = await signedIn(browser.context, stack.url, TOKENS.viewer, '#/sizing');
    const form = defaultForm(sizing);
    // The field basis the API takes (routes-sizing.ts): the median design-point k of the fleet.
    const k = median(sizing.vehicles.map((v) => v.design_check!.k_design_w_m2k));
    const first = await post(calculatorBody(form));
    expect(first.basis.k_w_m2k).toBe(k);
    const allowance = first.basis.fouling_allowance;
    const design = (heat_kw: number, ambient_c = Number(form.ambient_c)) =>
      answerDesign({
        ambient_c,
        heat_kw,
        coolant_limit_c: Number(form.coolant_limit_c),
        k_w_m2k: k,
        fouling_allowance: allowance,
        area_m2: Number(form.area_m2),
      });
    const area = '[data-fig="required-area"]';
    await expect
      .poll(() => text(page, area))
      .toBe(num(design(Number(form.heat_kw)).required_area_m2, 'm²', 3));
    expect(await text(page, '[data-fig="supported-ambient"]')).toBe(
      num(design(Number(form.heat_kw)).supported_ambient_c, '°C'),
    );
    await screenshot(page, 'sizing-sheet');

    // Twice the heat: twice the area (the rating formula is linear in Q), a cooler supported ambient.
    const hotter = 2 * Number(form.heat_kw);
    await page.locator('input[name="heat_kw"]').fill(String(hotter));
    await expect.poll(() => text(page, area)).toBe(num(design(hotter).required_area_m2, 'm²', 3));
    expect(await text(page, '[data-fig="supported-ambient"]')).toBe(
      num(design(hotter).supported_ambient_c, '°C'),
    );

    // The drivetrain comparison runs on the fleet's own duty, each figure's source named.
    expect(await text(page, '[data-fig="duty"]')).toContain(
      `${Math.round(sizing.drivetrains.duty.mass_kg).toLocaleString('en-US')} kg (fleet data)`,
    );
    // The drivetrain comparison follows the duty speed.
    await page.locator('input[name="speed_kmh"]').fill('90');
    const rows = compareDrivetrains(
      { ...sizing.drivetrains.duty, speed_kmh: 90, ambient_c: Number(form.ambient_c) },
      k,
      allowance,
    ).rows;
    for (const r of rows)
      await expect
        .poll(() =>
          text(page, `[data-table="drivetrains"] tr[data-powertrain="${r.powertrain}"] [data-col="heat"]`),
        )
        .toBe(num(r.heat_to_coolant_kw, 'kW'));

    // What if the days had been 10 K hotter: the vehicles that would have derated, as the API replays them.
    await page.locator('input[name="ambient_rise_k"]').fill('10');
    const want = await post({
      ...calculatorBody({ ...form, heat_kw: String(hotter), speed_kmh: '90', ambient_rise_k: '10' }),
    });
    const derated = want.what_if!.vehicles.filter((v) => v.hours > 0);
    await expect.poll(() => text(page, '[data-fig="what-if-summary"]')).toMatch(/^\d+ of/);
    expect(await text(page, '[data-fig="what-if-summary"]')).toContain(
      `${derated.length} of ${want.what_if!.vehicles.length} vehicles would have derated`,
    );
    expect(await page.locator('[data-table="what-if"] tbody tr').count()).toBe(derated.length);
    for (const v of derated)
      expect(await text(page, `[data-table="what-if"] tr[data-vehicle="${v.id}"] [data-col="hours"]`)).toBe(
        num(v.hours, 'h', 2),
      );
    await screenshot(page, 'sizing-sheet-what-if');

    // A limit below the ambient is refused by the API, field and rule shown.
    await page.locator('input[name="coolant_limit_c"]').fill('20');
    await expect.poll(() => text(page, '.calc-answer [role="alert"]')).toContain('design.coolant_limit_c');
    expect(browser.consoleErrors(/status of 400/)).toEqual([]);
    await page.close();
  });

  it('sign-in learns the role from /api/me', async () => {
    for (const role of ['viewer', 'engineer'] as const) {
      const page = await signedIn(browser.context, stack.url, TOKENS[role], '#/sizing');
      expect(await page.locator('[data-role]').getAttribute('data-role')).toBe(role);
      expect(await page.locator('[data-role]').getAttribute('title')).toBe(`signed in as ${role}-user`);
      await page.close();
    }
  });
});
