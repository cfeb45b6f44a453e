import { Resvg } from '@resvg/resvg-js';
import { beforeAll, describe, expect, it } from 'vitest';
import { GET as listRuns, POST as startRun } from '@/app/api/studies/[id]/power-runs/route';
import { GET as getRun } from '@/app/api/studies/[id]/power-runs/[runId]/route';
import { POST as cancelRun } from '@/app/api/studies/[id]/power-runs/[runId]/cancel/route';
import { POST as restartRun } from '@/app/api/studies/[id]/power-runs/[runId]/restart/route';
import { GET as exportRun } from '@/app/api/studies/[id]/power-runs/[runId]/export/route';
import { AuditEvent, Design, DesignVersion, PowerRun, PriorSet } from '@/db/models';
import { contentHash } from '@/lib/shared/canonical-json';
import { pngInfo } from '@/lib/server/figures/png';
import { markInterruptedRuns } from '@/lib/server/services/power-runner';
import { runScenario } from '@/lib/server/jobs/power/run-scenario';
import { buildScenario, runResult } from '@/lib/shared/power-scenario';
import type { FrozenDesign } from '@/lib/shared/validations/planner';
import type { PowerRunSpecInput } from '@/lib/shared/validations/power';
import { POWER_PRIOR, powerDesign } from '../support/frozen-design';
import { ctx, makeStudyWithTeam, migrateUp, requestAs, type TestUser } from '../support/integration';

beforeAll(migrateUp);

const prior = POWER_PRIOR;
// lateDelayLimit 3650 and a 10-item calibration keep a run of this file short
const content: FrozenDesign = powerDesign({ lateDelayLimit: 3650, calibration: { itemsPerMagnitude: 10, minDelay: 1, maxDelay: 365 } });

async function frozenVersion(studyId: number, userId: number) {
  const priorSet = await PriorSet.create({ studyId, name: 'Pilot prior', values: prior, source: 'manual', notes: '', createdBy: userId });
  const spec = { ...content.spec, priorSetId: priorSet.id };
  const design = await Design.create({ studyId, name: spec.name, spec, createdBy: userId });
  const frozen = { spec, prior: content.prior };
  return DesignVersion.create({ designId: design.id, studyId, number: 1, hash: contentHash(frozen), content: frozen, frozenBy: userId });
}

function runSpec(versionId: number, overrides: Partial<PowerRunSpecInput> = {}): PowerRunSpecInput {
  return {
    designVersionId: versionId,
    label: 'As the design assumes',
    truth: { model: { id: 'hyperbolic' }, prior, gamma: 10, lapse: 0.02 },
    calibration: 'simulated',
    test: { kind: 'mcnemar', alpha: 0.05, alternative: 'greater' },
    sampleSizes: [5, 10, 20],
    replications: 40,
    seed: 1,
    ...overrides,
  };
}

async function start(user: TestUser, studyId: number, spec: unknown) {
  return startRun(await requestAs(user, 'POST', `/api/studies/${studyId}/power-runs`, { json: spec }), ctx({ id: String(studyId) }));
}

async function read(user: TestUser, studyId: number, runId: number) {
  const response = await getRun(await requestAs(user, 'GET', `/api/studies/${studyId}/power-runs/${runId}`), ctx({ id: String(studyId), runId: String(runId) }));
  return (await response.json()).run;
}

async function waitFor(user: TestUser, studyId: number, runId: number, done: (run: { status: string; completed: number }) => boolean) {
  const deadline = Date.now() + 90_000;
  for (;;) {
    const run = await read(user, studyId, runId);
    if (done(run)) return run;
    if (Date.now() > deadline) throw new Error(`run ${runId} stuck in ${run.status}`);
    await new Promise((r) => setTimeout(r, 150));
  }
}

async function download(user: TestUser, studyId: number, runId: number, query: string) {
  return exportRun(await requestAs(user, 'GET', `/api/studies/${studyId}/power-runs/${runId}/export?${query}`), ctx({ id: String(studyId), runId: String(runId) }));
}

describe('power runs', () => {
  it('runs in the background, records progress and results, and everyone in the study can open them', async () => {
    const { study, team } = await makeStudyWithTeam('Power runs');
    const version = await frozenVersion(study.id, team.owner.id);
    const response = await start(team.editor, study.id, runSpec(version.id));
    expect(response.status).toBe(202);
    const { run } = await response.json();
    expect(['queued', 'running']).toContain(run.status);
    const finished = await waitFor(team.viewer, study.id, run.id, (r) => r.status === 'finished');
    expect(finished.completed).toBe(40);
    expect(finished.percent).toBe(100);
    const summary = finished.result.summary;
    expect(summary.points.map((p: { n: number }) => p.n)).toEqual([5, 10, 20]);
    for (const p of summary.points) {
      expect(p.lower).toBeLessThanOrEqual(p.power);
      expect(p.upper).toBeGreaterThanOrEqual(p.power);
    }
    expect(finished.result.methodText).toMatch(/exact McNemar/);
    expect(finished.result.methodText).toContain(version.hash);
    expect(finished.result.methodText).toMatch(/Switchback \d+\.\d+\.\d+/);
    const listed = await (await listRuns(await requestAs(team.viewer, 'GET', `/api/studies/${study.id}/power-runs`), ctx({ id: String(study.id) }))).json();
    expect(listed.runs.map((r: { id: number }) => r.id)).toContain(run.id);
    expect(await AuditEvent.count({ where: { studyId: study.id, action: 'power-run.start' } })).toBe(1);
  });

  it('gives identical results from the app with the same spec and seed, and from 1 or 2 worker threads', async () => {
    const { study, team } = await makeStudyWithTeam('Power reproducibility');
    const version = await frozenVersion(study.id, team.owner.id);
    const spec = runSpec(version.id, { replications: 30 });
    const one = await runScenario(buildScenario(spec as never, content), { workers: 1, chunkSize: 7 });
    const two = await runScenario(buildScenario(spec as never, content), { workers: 2, chunkSize: 4 });
    expect(two).toEqual(one);
    const a = (await (await start(team.editor, study.id, spec)).json()).run;
    const b = (await (await start(team.editor, study.id, spec)).json()).run;
    const ra = await waitFor(team.editor, study.id, a.id, (r) => r.status === 'finished');
    const rb = await waitFor(team.editor, study.id, b.id, (r) => r.status === 'finished');
    expect(ra.result.summary).toEqual(rb.result.summary);
    expect(ra.result.summary.points.map((p: { rejections: number }) => p.rejections)).toEqual(one!.tally.rejections);
  });

  it('downloads SVG, PNG at 300 dpi, CSV and JSON of a finished run, and compares two runs on one chart', async () => {
    const { study, team } = await makeStudyWithTeam('Power downloads');
    const version = await frozenVersion(study.id, team.owner.id);
    const a = (await (await start(team.editor, study.id, runSpec(version.id, { replications: 20 }))).json()).run;
    const b = (await (await start(team.editor, study.id, runSpec(version.id, { replications: 20, label: 'Delay sensitivity 0.6', truth: { model: { id: 'hyperboloid', sensitivity: 0.6 }, prior, gamma: 10, lapse: 0.02 } }))).json()).run;
    await waitFor(team.viewer, study.id, a.id, (r) => r.status === 'finished');
    await waitFor(team.viewer, study.id, b.id, (r) => r.status === 'finished');

    const svg = await download(team.viewer, study.id, a.id, 'format=svg');
    expect(svg.headers.get('content-type')).toBe('image/svg+xml');
    const svgText = await svg.text();
    const parsed = new Resvg(svgText); // resvg parses the SVG and refuses malformed XML
    // 6.5 inches wide; 4.2 inches high plus 0.15 inch per wrapped line after the first (caption,
    // the pooled McNemar warning, the caution), at the CSS 96 px per inch resvg reads "in" with
    const lines = (svgText.match(/data-line="/g) ?? []).length;
    const inchesHigh = 4.2 + 0.15 * (lines - 1);
    expect(lines).toBeGreaterThanOrEqual(3);
    expect([parsed.width, parsed.height]).toEqual([624, Math.round(inchesHigh * 96)]);
    // the download carries its font (base64 WOFF2 in @font-face), so it renders the same elsewhere
    expect(svgText).toMatch(/@font-face\{font-family:'Source Sans 3';[^}]*src:url\(data:font\/woff2;base64,/);
    expect(svgText).toContain('not a clinical assessment');
    expect(svgText).toContain('Wilson 95 %');
    expect(svgText).toContain('Pooled McNemar test assumes independent pairs');
    expect(svgText).toContain('Fewer than 1,000 replications (20): Monte Carlo standard error up to');

    const png = Buffer.from(await (await download(team.viewer, study.id, a.id, 'format=png')).arrayBuffer());
    expect(png.subarray(1, 4).toString()).toBe('PNG');
    // 6.5 inches × the SVG's height at 300 dpi; 300 dpi = 11811 pixels per metre (300 / 0.0254, rounded)
    expect(pngInfo(png)).toEqual({ width: 1950, height: Math.round(inchesHigh * 300), pixelsPerMetre: 11811 });

    const csv = await (await download(team.viewer, study.id, a.id, 'format=csv')).text();
    expect(csv.split('\r\n')[0]).toMatch(/^truth,n,power,wilson_lower,wilson_upper,/);
    expect(csv.trim().split('\n')).toHaveLength(4);
    const json = await (await download(team.viewer, study.id, a.id, 'format=json')).json();
    expect(json.design.hash).toBe(version.hash);
    expect(json.spec.seed).toBe(1);

    const compared = await (await download(team.viewer, study.id, a.id, `format=svg&compare=${b.id}`)).text();
    expect(compared).toContain('Delay sensitivity 0.6');
    expect(compared).toContain('As the design assumes');
    expect((await download(team.viewer, study.id, a.id, 'format=gif')).status).toBe(422);
  });

  it('cancels a running run, keeps it cancelled, and restarts it from the start', async () => {
    const { study, team } = await makeStudyWithTeam('Power cancel');
    const version = await frozenVersion(study.id, team.owner.id);
    const run = (await (await start(team.editor, study.id, runSpec(version.id, { replications: 20000, sampleSizes: [50, 100, 200] }))).json()).run;
    await waitFor(team.viewer, study.id, run.id, (r) => r.status === 'running' && r.completed > 0);
    const cancel = await cancelRun(await requestAs(team.editor, 'POST', `/api/studies/${study.id}/power-runs/${run.id}/cancel`), ctx({ id: String(study.id), runId: String(run.id) }));
    expect(cancel.status).toBe(200);
    expect((await cancel.json()).run.status).toBe('cancelled');
    await new Promise((r) => setTimeout(r, 1500));
    const after = await read(team.viewer, study.id, run.id);
    expect(after.status).toBe('cancelled');
    expect(after.completed).toBeLessThan(20000);
    expect(after.message).toMatch(/Cancelled by/);
    const again = await cancelRun(await requestAs(team.editor, 'POST', `/api/studies/${study.id}/power-runs/${run.id}/cancel`), ctx({ id: String(study.id), runId: String(run.id) }));
    expect(again.status).toBe(409);
    // shrink the run so its restart finishes quickly, then restart it
    await PowerRun.update({ spec: { ...after.spec, replications: 20 }, total: 20 }, { where: { id: run.id } });
    const restart = async () => restartRun(await requestAs(team.editor, 'POST', `/api/studies/${study.id}/power-runs/${run.id}/restart`), ctx({ id: String(study.id), runId: String(run.id) }));
    let restarted = await restart();
    for (let i = 0; restarted.status === 409 && i < 40; i++) {
      await new Promise((r) => setTimeout(r, 250)); // the old run may still be stopping
      restarted = await restart();
    }
    expect(restarted.status).toBe(202);
    const finished = await waitFor(team.viewer, study.id, run.id, (r) => r.status === 'finished');
    expect(finished.completed).toBe(20);
  });

  it('marks a run whose server stopped as interrupted with a clear message, and restarts it', async () => {
    const { study, team } = await makeStudyWithTeam('Power interrupted');
    const version = await frozenVersion(study.id, team.owner.id);
    const spec = runSpec(version.id, { replications: 20 });
    // a run left "running" by a server that died: its heartbeat is old and no process runs it
    const orphan = await PowerRun.create({
      studyId: study.id, designVersionId: version.id, label: 'orphan', spec: spec as never, status: 'running', completed: 8, total: 20,
      engineVersion: '1', createdBy: team.editor.id, startedAt: new Date(Date.now() - 120_000), heartbeatAt: new Date(Date.now() - 60_000),
    });
    expect(await markInterruptedRuns(20_000, { studyId: study.id })).toBe(1);
    const interrupted = await read(team.viewer, study.id, orphan.id);
    expect(interrupted.status).toBe('interrupted');
    expect(interrupted.message).toMatch(/server stopped while this run was in progress \(8 of 20 replicates done\)/);
    const viewerTry = await restartRun(await requestAs(team.viewer, 'POST', `/api/studies/${study.id}/power-runs/${orphan.id}/restart`), ctx({ id: String(study.id), runId: String(orphan.id) }));
    expect(viewerTry.status).toBe(403);
    const restarted = await restartRun(await requestAs(team.editor, 'POST', `/api/studies/${study.id}/power-runs/${orphan.id}/restart`), ctx({ id: String(study.id), runId: String(orphan.id) }));
    expect(restarted.status).toBe(202);
    expect((await waitFor(team.viewer, study.id, orphan.id, (r) => r.status === 'finished')).completed).toBe(20);
  });

  it('refuses versions of other studies, bad specs and downloads before the end, naming the problem', async () => {
    const { study, team } = await makeStudyWithTeam('Power input');
    const other = await makeStudyWithTeam('Other power study');
    const foreign = await frozenVersion(other.study.id, other.team.owner.id);
    const version = await frozenVersion(study.id, team.owner.id);
    const wrongStudy = await start(team.editor, study.id, runSpec(foreign.id));
    expect(wrongStudy.status).toBe(422);
    expect(JSON.stringify(await wrongStudy.json())).toMatch(/designVersionId/);
    const descending = await start(team.editor, study.id, runSpec(version.id, { sampleSizes: [40, 20] }));
    expect(descending.status).toBe(422);
    expect(JSON.stringify(await descending.json())).toMatch(/sampleSizes\.1/);
    const noAnchors = await start(team.editor, study.id, runSpec(version.id, { test: { kind: 'probes-vs-anchors', alpha: 0.05, alternative: 'greater' }, replications: 20000, sampleSizes: [100, 200] }));
    expect(noAnchors.status).toBe(202);
    const running = (await noAnchors.json()).run;
    const early = await download(team.viewer, study.id, running.id, 'format=csv');
    expect(early.status).toBe(409);
    await cancelRun(await requestAs(team.editor, 'POST', `/api/studies/${study.id}/power-runs/${running.id}/cancel`), ctx({ id: String(study.id), runId: String(running.id) }));
  });

  it('simulates stress truths beside the assumed one and shows power under each in the result, the figure and the CSV', async () => {
    const { study, team } = await makeStudyWithTeam('Power stress');
    const version = await frozenVersion(study.id, team.owner.id);
    const stress = [{ kind: 'delay-sensitivity', low: 0.4, high: 0.9 }, { kind: 'choice-noise', factor: 0.5 }];
    const response = await start(team.editor, study.id, { ...runSpec(version.id, { replications: 20, test: { kind: 'sign', alpha: 0.05, alternative: 'greater' } }), stress });
    expect(response.status).toBe(202);
    const { run } = await response.json();
    expect(run.total).toBe(60); // 20 replicates under each of three truths
    const finished = await waitFor(team.viewer, study.id, run.id, (r) => r.status === 'finished');
    expect(finished.completed).toBe(60);
    expect(finished.result.stress.map((s: { stress: { kind: string } }) => s.stress.kind)).toEqual(['delay-sensitivity', 'choice-noise']);
    expect(finished.result.stress[0].summary.points.map((p: { n: number }) => p.n)).toEqual([5, 10, 20]);
    expect(finished.result.methodText).toContain('2 stress truth(s)');
    expect(finished.result.methodText).toMatch(/Monte Carlo standard error of up to/);
    expect(finished.result.summary.warnings.map((w: { kind: string }) => w.kind)).toContain('extrapolation-risk');

    const svg = await (await download(team.viewer, study.id, run.id, 'format=svg')).text();
    expect(svg).toContain('Stress: s ~ U(0.4, 0.9)');
    expect(svg).toContain('Stress: noisier choices (γ × 0.5)');
    expect(svg).toContain('Fewer than 1,000 replications (20)');
    const csv = (await (await download(team.viewer, study.id, run.id, 'format=csv')).text()).trim().split('\n');
    expect(csv).toHaveLength(1 + 3 * 3);
    expect(csv.filter((line) => line.startsWith('"s ~ U(0.4, 0.9)"'))).toHaveLength(3);

    // a stress truth out of range is a 422 naming its field
    const bad = await start(team.editor, study.id, { ...runSpec(version.id), stress: [{ kind: 'present-bias', beta: 1.5 }] });
    expect(bad.status).toBe(422);
    expect(JSON.stringify(await bad.json())).toContain('stress.0.beta');
  });

  it('simulates the design’s other calibration under every truth when asked, and shows both in the result, the CSV and the JSON', async () => {
    const { study, team } = await makeStudyWithTeam('Power calibration compared');
    const version = await frozenVersion(study.id, team.owner.id);
    const stress = [{ kind: 'delay-sensitivity', low: 0.4, high: 0.9 }];
    const response = await start(team.editor, study.id, { ...runSpec(version.id, { replications: 10, test: { kind: 'sign', alpha: 0.05, alternative: 'greater' } }), stress, compareCalibration: true });
    expect(response.status).toBe(202);
    const { run } = await response.json();
    expect(run.total).toBe(40); // 10 replicates under each of two truths, with each of two calibrations
    const finished = await waitFor(team.viewer, study.id, run.id, (r) => r.status === 'finished');
    const comparison = finished.result.calibrationComparison;
    expect(comparison.rows.map((r: { truth: string }) => r.truth)).toEqual(['the assumed truth', 'delay sensitivity s drawn per participant from U(0.4, 0.9)']);
    expect(comparison.other).toMatch(/power-delay hyperbola \(Rachlin 2006\) by maximum likelihood/);
    expect(finished.result.methodText).toContain("The same truths were simulated with the design's other calibration");
    const csv = (await (await download(team.viewer, study.id, run.id, 'format=csv')).text()).trim().split('\r\n');
    expect(csv).toHaveLength(1 + 2 * 2 * 3);
    expect(csv.filter((line) => line.endsWith(',other'))).toHaveLength(6);
    const json = await (await download(team.viewer, study.id, run.id, 'format=json')).json();
    expect(json.calibrationComparison.rows).toHaveLength(2);
    // the comparison needs a simulated calibration block
    const bad = await start(team.editor, study.id, { ...runSpec(version.id), calibration: 'known', compareCalibration: true });
    expect(bad.status).toBe(422);
    expect(JSON.stringify(await bad.json())).toContain('compareCalibration');
  });

  it('still opens a run saved before stress truths and participant-level tests existed, with its stored test name', async () => {
    const { study, team } = await makeStudyWithTeam('Power old run');
    const version = await frozenVersion(study.id, team.owner.id);
    const { stress: _none, ...oldSpec } = { ...runSpec(version.id), stress: [] };
    const scenario = buildScenario({ ...oldSpec, label: '', stress: [] } as never, version.content as FrozenDesign);
    const outcome = await runScenario(scenario, { workers: 1 });
    const { stress: _s, ...oldResult } = runResult([scenario], [outcome!], { number: 1, hash: version.hash, content: version.content as FrozenDesign });
    const row = await PowerRun.create({
      studyId: study.id,
      designVersionId: version.id,
      label: 'Saved last year',
      spec: oldSpec as never, // as stored before: no stress list
      status: 'finished',
      completed: 40,
      total: 40,
      tally: outcome!.tally,
      result: oldResult,
      engineVersion: '1',
      createdBy: team.owner.id,
    });
    const opened = await read(team.viewer, study.id, row.id);
    expect(opened.spec.test.kind).toBe('mcnemar');
    expect(opened.spec.stress).toEqual([]);
    expect(opened.result.stress).toEqual([]);
    const svg = await (await download(team.viewer, study.id, row.id, 'format=svg')).text();
    expect(svg).toContain('Pooled McNemar test assumes independent pairs');
  });
});
