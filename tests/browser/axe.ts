import fs from 'node:fs';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';

/**
 * Accessibility checks with axe-core. The app's CSP forbids inline scripts, so axe runs in its own browser context
 * created with `bypassCSP: true`; the pages the other specs use keep the real policy.
 */
const AXE_SOURCE = fs.readFileSync(require.resolve('axe-core/axe.min.js'), 'utf8');

/** The impacts that fail a check (axe's two highest of four). */
const FAILING = new Set(['serious', 'critical']);

export interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[]; failureSummary: string }[];
}

let browser: Browser | undefined;
let context: BrowserContext | undefined;

/** A page in the axe context (its own cookies and local storage, CSP bypassed). */
export async function axePage(viewport: { width: number; height: number }): Promise<Page> {
  if (!context) {
    browser = await chromium.launch({
      executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
      args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking'],
    });
    context = await browser.newContext({ bypassCSP: true });
  }
  const page = await context.newPage();
  await page.setViewportSize(viewport);
  page.setDefaultTimeout(20_000);
  return page;
}

export async function closeAxe(): Promise<void> {
  await context?.close().catch(() => undefined);
  await browser?.close().catch(() => undefined);
  context = undefined;
  browser = undefined;
}

/** Runs axe on the page as it is now; returns the serious and critical violations. */
export async function axeViolations(page: Page): Promise<AxeViolation[]> {
  const loaded = await page.evaluate(() => typeof (globalThis as { axe?: unknown }).axe === 'object');
  if (!loaded) await page.addScriptTag({ content: AXE_SOURCE });
  const results = await page.evaluate(async () => {
    const axe = (globalThis as unknown as { axe: { run: (ctx: unknown, opts: unknown) => Promise<unknown> } }).axe;
    const r = (await axe.run((globalThis as unknown as { document: unknown }).document, {
      resultTypes: ['violations'],
    })) as {
      violations: {
        id: string;
        impact: string | null;
        help: string;
        nodes: { target: unknown[]; failureSummary?: string }[];
      }[];
    };
    return r.violations.map((v) => ({
      id: v.id,
      impact: v.impact,
      help: v.help,
      nodes: v.nodes.map((n) => ({ target: n.target.map(String), failureSummary: n.failureSummary ?? '' })),
    }));
  });
  return results.filter((v) => v.impact !== null && FAILING.has(v.impact));
}

export function describeViolations(name: string, violations: AxeViolation[]): string {
  const lines = [`${name}: ${violations.length} serious or critical accessibility violation(s)`];
  for (const v of violations) {
    lines.push(`  [${v.impact}] ${v.id}: ${v.help} (${v.nodes.length} node(s))`);
    for (const n of v.nodes.slice(0, 5)) {
      lines.push(`    ${n.target.join(' ')}\n      ${n.failureSummary.replace(/\n/g, '\n      ')}`);
    }
  }
  return lines.join('\n');
}

/** Fails on any serious or critical axe violation of the page as it is now, printing them. */
export async function checkA11y(page: Page, name: string): Promise<void> {
  const violations = await axeViolations(page);
  if (violations.length) {
    const text = describeViolations(name, violations);
    console.log(text);
    throw new Error(text);
  }
}
