// Renders one HTML report in headless Chromium, driven over the DevTools protocol on a pipe (fds 3 and 4; no
// npm packages needed), and fails when the page logs a console error, throws, or a figure listed in
// <meta name="switchfit-figures"> is missing, empty or not laid out.
// Usage: node render-report.mjs CHROMIUM REPORT.html OUTDIR
// Writes OUTDIR/report.png (full page), OUTDIR/console.txt and OUTDIR/figures.json. Exit 0 = pass, 1 = fail,
// 2 = could not run.
import { spawn } from 'node:child_process';
import { mkdtempSync, writeFileSync, mkdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';

const [chromium, report, outDir] = process.argv.slice(2);
if (!chromium || !report || !outDir) {
  console.error('usage: node render-report.mjs CHROMIUM REPORT.html OUTDIR');
  process.exit(2);
}
mkdirSync(outDir, { recursive: true });
const profile = mkdtempSync(join(tmpdir(), 'render-report-'));
const args = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
  '--disable-background-networking', '--disable-component-update', '--disable-sync', '--hide-scrollbars',
  `--user-data-dir=${profile}`, '--remote-debugging-pipe', 'about:blank'];
const child = spawn(chromium, args, { stdio: ['ignore', 'ignore', 'pipe', 'pipe', 'pipe'] });
let browserLog = '';
child.on('error', (e) => {
  console.error(`render-report: could not start ${chromium}: ${e.message}`);
  process.exit(2);
});
child.stderr.on('data', (d) => { browserLog += d; });

const toBrowser = child.stdio[3];
const fromBrowser = child.stdio[4];
let nextId = 1;
const pending = new Map();
const listeners = [];
let buffer = '';
fromBrowser.on('data', (chunk) => {
  buffer += chunk.toString('utf8');
  let end;
  while ((end = buffer.indexOf('\0')) >= 0) {
    const msg = JSON.parse(buffer.slice(0, end));
    buffer = buffer.slice(end + 1);
    if (msg.id && pending.has(msg.id)) {
      const { ok, fail } = pending.get(msg.id);
      pending.delete(msg.id);
      if (msg.error) fail(new Error(JSON.stringify(msg.error))); else ok(msg.result);
    } else if (msg.method) {
      for (const l of listeners) l(msg);
    }
  }
});
function send(method, params = {}, sessionId) {
  const id = nextId++;
  const msg = { id, method, params };
  if (sessionId) msg.sessionId = sessionId;
  toBrowser.write(JSON.stringify(msg) + '\0');
  return new Promise((ok, fail) => pending.set(id, { ok, fail }));
}
function waitFor(method, ms) {
  return new Promise((ok, fail) => {
    const t = setTimeout(() => fail(new Error(`timed out after ${ms} ms waiting for ${method}`)), ms);
    listeners.push((m) => { if (m.method === method) { clearTimeout(t); ok(m.params); } });
  });
}

const problems = [];
const consoleLines = [];
listeners.push((m) => {
  const p = m.params || {};
  if (m.method === 'Runtime.consoleAPICalled') {
    const text = (p.args || []).map((a) => a.value ?? a.description ?? '').join(' ');
    consoleLines.push(`console.${p.type}: ${text}`);
    if (p.type === 'error' || p.type === 'assert') problems.push(`console error: ${text}`);
  } else if (m.method === 'Runtime.exceptionThrown') {
    const d = p.exceptionDetails || {};
    const text = (d.exception && d.exception.description) || d.text;
    consoleLines.push(`exception: ${text}`);
    problems.push(`uncaught exception: ${text}`);
  } else if (m.method === 'Log.entryAdded') {
    const e = p.entry || {};
    consoleLines.push(`log.${e.level} (${e.source}): ${e.text}${e.url ? ' ' + e.url : ''}`);
    if (e.level === 'error') problems.push(`console error (${e.source}): ${e.text}${e.url ? ' ' + e.url : ''}`);
  }
});

// Runs in the page; plain DOM queries only. Returns one entry per expected figure.
const CHECK = `(() => {
  const meta = document.querySelector('meta[name="switchfit-figures"]');
  const expected = meta ? meta.content.split(/\\s+/).filter((s) => s.length > 0) : null;
  const present = [...document.querySelectorAll('svg[data-figure]')].map((s) => s.getAttribute('data-figure'));
  const figures = (expected || []).map((id) => {
    const svgs = [...document.querySelectorAll('svg[data-figure]')].filter((s) => s.getAttribute('data-figure') === id);
    if (svgs.length !== 1) return { id, ok: false, why: svgs.length + ' svg elements with this id' };
    const svg = svgs[0];
    const r = svg.getBoundingClientRect();
    const drawn = svg.querySelectorAll('path, line, circle, rect, polygon, polyline, text').length;
    let box = { width: 0, height: 0 };
    try { box = svg.getBBox(); } catch (e) { /* not rendered */ }
    const ok = r.width > 50 && r.height > 50 && drawn > 0 && box.width > 0 && box.height > 0;
    return { id, ok, width: r.width, height: r.height, drawn, why: ok ? '' : 'empty or not laid out' };
  });
  return { expected, present, figures, height: document.documentElement.scrollHeight };
})()`;

async function main() {
  const { targetId } = await send('Target.createTarget', { url: 'about:blank' });
  const { sessionId } = await send('Target.attachToTarget', { targetId, flatten: true });
  await send('Page.enable', {}, sessionId);
  await send('Runtime.enable', {}, sessionId);
  await send('Log.enable', {}, sessionId);
  await send('Emulation.setDeviceMetricsOverride',
    { width: 1200, height: 900, deviceScaleFactor: 1, mobile: false }, sessionId);
  const loaded = waitFor('Page.loadEventFired', 60000);
  const nav = await send('Page.navigate', { url: pathToFileURL(resolve(report)).href }, sessionId);
  if (nav.errorText) throw new Error(`navigation failed: ${nav.errorText}`);
  await loaded;
  await new Promise((r) => setTimeout(r, 300)); // let late console messages arrive
  const res = await send('Runtime.evaluate', { expression: CHECK, returnByValue: true }, sessionId);
  if (res.exceptionDetails) throw new Error('page check failed: ' + JSON.stringify(res.exceptionDetails));
  const v = res.result.value;
  writeFileSync(join(outDir, 'figures.json'), JSON.stringify(v, null, 2) + '\n');
  if (v.expected === null) problems.push('no <meta name="switchfit-figures"> in the page');
  for (const f of v.figures) if (!f.ok) problems.push(`figure '${f.id}': ${f.why}`);
  for (const id of v.present) {
    if (v.expected && !v.expected.includes(id)) problems.push(`figure '${id}' is not listed in the meta tag`);
  }
  await send('Emulation.setDeviceMetricsOverride',
    { width: 1200, height: Math.min(Math.max(v.height, 300), 16000), deviceScaleFactor: 1, mobile: false },
    sessionId);
  const shot = await send('Page.captureScreenshot', { format: 'png' }, sessionId);
  writeFileSync(join(outDir, 'report.png'), Buffer.from(shot.data, 'base64'));
  writeFileSync(join(outDir, 'console.txt'), consoleLines.join('\n') + (consoleLines.length ? '\n' : ''));
  return v.figures.length;
}

let code = 0;
const guard = setTimeout(() => {
  console.error('render-report: timed out after 150 s');
  child.kill('SIGKILL');
  process.exit(2);
}, 150000);
try {
  const n = await main();
  if (problems.length) {
    for (const p of problems) console.error(`render-report: FAIL: ${p}`);
    code = 1;
  } else {
    console.log(`render-report: OK: ${n} figures drawn, no console errors; screenshot ${join(outDir, 'report.png')}`);
  }
} catch (e) {
  console.error(`render-report: could not render: ${e.message}`);
  if (browserLog) console.error(browserLog.split('\n').slice(-10).join('\n'));
  code = 2;
} finally {
  clearTimeout(guard);
  try { await send('Browser.close'); } catch (e) { /* already gone */ }
  process.exitCode = code;
  const done = () => { rmSync(profile, { recursive: true, force: true }); process.exit(code); };
  if (child.exitCode !== null || child.signalCode !== null) {
    done();
  } else {
    setTimeout(() => child.kill('SIGKILL'), 2000).unref();
    child.on('exit', done);
  }
}
