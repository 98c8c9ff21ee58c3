// The built-in page (GET /) in Debian's headless Chromium, driven by playwright-core:
// it loads without console errors, draws one Planck curve per temperature entered
// with each Wien peak where Wien's law puts it, computes a corrected temperature
// with its uncertainty budget, names the field when an input is wrong, and leaves
// screenshots under build/browser/ for a person to look at.
//
// Run: make test-browser (installs Chromium and this folder's packages first).
// Environment: GREYBODYD (default build/greybodyd), CHROMIUM (default /usr/bin/chromium).
import assert from "node:assert/strict";
import {spawn} from "node:child_process";
import {createWriteStream, mkdirSync, mkdtempSync, rmSync} from "node:fs";
import {tmpdir} from "node:os";
import {dirname, join, resolve} from "node:path";
import {after, before, test} from "node:test";
import {fileURLToPath} from "node:url";

import {chromium} from "playwright-core";

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), "..", "..");
const OUTPUT = join(ROOT, "build", "browser");
const SERVER = process.env.GREYBODYD || join(ROOT, "build", "greybodyd");
const CHROMIUM = process.env.CHROMIUM || "/usr/bin/chromium";
// The flags this machine needs: no sandbox as root, no GPU, and no traffic of the browser's own.
const CHROMIUM_FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
  "--no-first-run", "--disable-background-networking", "--disable-component-update",
  "--disable-sync"];
const WAIT_MS = 15000;

// Wien's displacement constant b = 2897.771955 µm K (CODATA 2018).
const WIEN_B_UM_K = 2897.771955;

let server;
let baseUrl;
let context;
let page;
let profile;
const consoleErrors = [];

function startServer() {
  mkdirSync(OUTPUT, {recursive: true});
  const log = createWriteStream(join(OUTPUT, "greybodyd.log"));
  const child = spawn(SERVER, ["--listen", "127.0.0.1:0"], {stdio: ["ignore", "ignore", "pipe"]});
  return new Promise((resolvePort, reject) => {
    const timer = setTimeout(() => reject(new Error(`${SERVER} did not report its port`)), WAIT_MS);
    let pending = "";
    child.on("error", reject);
    child.on("exit", (code) => reject(new Error(`${SERVER} exited with ${code} before listening`)));
    child.stderr.on("data", (chunk) => {
      log.write(chunk);
      pending += chunk.toString();
      const match = /listening on [^"]*\(port (\d+)\)/.exec(pending);
      if (match) {
        clearTimeout(timer);
        pending = "";
        resolvePort({child, port: Number(match[1])});
      }
    });
  });
}

async function curveCount(svgId) {
  return page.locator(`#${svgId} path.curve`).count();
}

async function statusText(id) {
  return (await page.locator(`#${id}`).textContent()).trim();
}

before(async () => {
  const started = await startServer();
  server = started.child;
  baseUrl = `http://127.0.0.1:${started.port}`;
  profile = mkdtempSync(join(tmpdir(), "greybody-chromium-"));
  context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM, headless: true, args: CHROMIUM_FLAGS,
    viewport: {width: 1180, height: 900},
  });
  page = context.pages()[0] || await context.newPage();
  page.on("console", (message) => {
    if (message.type() === "error") consoleErrors.push(message.text());
  });
  page.on("pageerror", (error) => consoleErrors.push(String(error)));
  await page.goto(`${baseUrl}/`);
  await page.waitForSelector("body[data-ready='true']", {timeout: WAIT_MS});
});

after(async () => {
  if (context) await context.close();
  if (server) server.kill("SIGTERM");
  if (profile) rmSync(profile, {recursive: true, force: true});
});

test("the page loads and draws its first curves without console errors", async () => {
  assert.equal(await page.title(), "greybody · curves and uncertainty");
  assert.equal(await curveCount("spectra-plot"), 3); // the form starts with 300, 600, 1200 K
  assert.equal(await page.locator("#spectra-plot rect.interval").count(), 1);
  assert.match(await page.locator(".cautions").innerText(), /Not for medical use/);
  assert.deepEqual(consoleErrors, []);
});

test("entering temperatures redraws one curve per temperature, peaks where Wien's law puts them",
  async () => {
    const temperatures = [250, 400, 800, 1600, 3000];
    await page.fill("#spectra-temperatures", temperatures.join(", "));
    await page.click("#spectra-draw");
    await page.waitForFunction(
      () => document.getElementById("spectra-status").textContent === "5 curves drawn.",
      null, {timeout: WAIT_MS});
    assert.equal(await curveCount("spectra-plot"), 5);
    assert.equal(await page.locator("#spectra-table tbody tr").count(), 5);
    const peaks = await page.locator("#spectra-plot circle.marker").evaluateAll(
      (circles) => circles.map((c) => Number(c.dataset.x)));
    assert.equal(peaks.length, 5);
    temperatures.forEach((t, i) => {
      const expected = WIEN_B_UM_K / t;
      assert.ok(Math.abs(peaks[i] - expected) <= 1e-8 * expected,
        `peak of ${t} K at ${peaks[i]} µm, Wien's law says ${expected} µm`);
    });
    // every curve is drawn through the whole axis (no element silently missing)
    const vertices = await page.locator("#spectra-plot path.curve").evaluateAll(
      (paths) => paths.map((p) => Number(p.dataset.vertices)));
    assert.ok(vertices.every((n) => n > 200), `vertices per curve: ${vertices}`);
    await page.screenshot({path: join(OUTPUT, "planck-curves.png"), fullPage: true});
    assert.deepEqual(consoleErrors, []);
  });

test("the uncertainty view reproduces worked example A", async () => {
  await page.click("#tab-uncertainty");
  // Worked example A (REFERENCES.md): flat 8–14 µm band, T_app = 308.15 K, ε = 0.95,
  // T_r = 293.15 K, τ = 1; u(ε) = 0.02, u(T_r) = 2 K, u(T_app) = 0.5 K
  // → T = 308.886829 K, u_c = 0.614 K.
  await page.selectOption("#u-unit", "K");
  await page.selectOption("#u-model", "band");
  for (const [id, value] of [["u-apparent", "308.15"], ["u-apparent-u", "0.5"],
    ["u-emissivity", "0.95"], ["u-emissivity-u", "0.02"], ["u-reflected", "293.15"],
    ["u-reflected-u", "2"], ["u-transmittance", "1"], ["u-transmittance-u", "0"],
    ["u-atmosphere", "293.15"], ["u-atmosphere-u", "0"], ["u-band-from", "8"],
    ["u-band-to", "14"], ["u-span", "0.1"]]) {
    await page.fill(`#${id}`, value);
  }
  await page.click("#uncertainty-compute");
  await page.waitForFunction(
    () => /K$/.test(document.getElementById("u-temperature").textContent) &&
          document.getElementById("uncertainty-status").textContent.startsWith("Computed"),
    null, {timeout: WAIT_MS});
  const shown = parseFloat(await page.locator("#u-temperature").textContent());
  assert.ok(Math.abs(shown - 308.886829) <= 0.005 + 1e-9, `shown ${shown} K`);
  const combined = parseFloat(await page.locator("#u-combined").textContent());
  assert.ok(Math.abs(combined - 0.614) <= 0.0005 + 1e-9, `u_c shown ${combined} K`);
  assert.equal(await page.locator("#budget-table tbody tr").count(), 5);
  // The error curve is drawn where 0 < ε + Δε ≤ 1: Δε runs over [-0.1, 0.1] in 80 steps.
  let defined = 0;
  for (let i = 0; i <= 80; i++) {
    const delta = -0.1 + 0.2 * i / 80;
    if (0.95 + delta > 0 && 0.95 + delta <= 1 + 1e-12) defined++;
  }
  assert.equal(await curveCount("error-plot"), 1);
  const drawn = Number(await page.locator("#error-plot path.curve").getAttribute("data-vertices"));
  assert.equal(drawn, defined);
  await page.screenshot({path: join(OUTPUT, "uncertainty.png"), fullPage: true});
  assert.deepEqual(consoleErrors, []);
});

test("a wrong entry is reported with its field and leaves the last plot standing", async () => {
  await page.click("#tab-spectra");
  await page.fill("#spectra-temperatures", "300, abc");
  await page.click("#spectra-draw");
  await page.waitForFunction(
    () => document.getElementById("spectra-status").classList.contains("is-error"),
    null, {timeout: WAIT_MS});
  assert.match(await statusText("spectra-status"), /^Temperatures: "abc" is not a number/);
  assert.equal(await curveCount("spectra-plot"), 5);

  // Out of the physics' domain: the server's problem detail comes back naming the field.  The
  // browser reports the 422 itself on the console; nothing else may appear there.
  const before = consoleErrors.length;
  await page.fill("#spectra-temperatures", "300, -20");
  await page.click("#spectra-draw");
  await page.waitForFunction(
    () => /out of range/.test(document.getElementById("spectra-status").textContent),
    null, {timeout: WAIT_MS});
  assert.match(await statusText("spectra-status"),
    /^temperatures\[1\] is out of range.*\(field temperatures\)$/);
  assert.equal(await curveCount("spectra-plot"), 5);
  const reported = consoleErrors.splice(before);
  assert.ok(reported.every((text) => /status of 422/.test(text)), `console: ${reported}`);
  assert.deepEqual(consoleErrors, []);
});
