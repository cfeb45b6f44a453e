// Item-bank export on the real MariaDB: file name and header cite study, hash and seed; each
// download is audited; viewers are refused; bad options are named.
import { beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '@/db/models';
import { GET as exportBank } from '@/app/api/studies/[id]/item-bank/[versionId]/export/route';
import { GET as preview } from '@/app/api/studies/[id]/item-bank/[versionId]/route';
import { GET as versions } from '@/app/api/studies/[id]/item-bank/route';
import { ctx, makeStudyWithTeam, migrateUp, requestAs } from '../support/integration';
import { modelDiscrimination } from '@/lib/criteria';
import { demoContent, makeFrozenVersion } from './item-bank-support';

describe('item-bank export', () => {
  beforeAll(migrateUp);

  it('downloads CSV and JSON with study, hash and seed in name and header, and audits each download', async () => {
    const { study, team } = await makeStudyWithTeam('Export study');
    const version = await makeFrozenVersion(study.id);
    const params = ctx({ id: String(study.id), versionId: String(version.id) });
    const listed = await versions(await requestAs(team.operator, 'GET', `/api/studies/${study.id}/item-bank`), ctx({ id: String(study.id) }));
    expect(((await listed.json()) as { versions: Array<{ hash: string }> }).versions.map((v) => v.hash)).toEqual([version.hash]);

    const csv = await exportBank(await requestAs(team.operator, 'GET', `/api/studies/${study.id}/item-bank/${version.id}/export?format=csv&seed=42&delayUnit=weeks`), params);
    expect(csv.status).toBe(200);
    expect(csv.headers.get('content-disposition')).toContain(`switchback-items-${study.id}-export-study-${version.hash.slice(0, 12)}-seed42.csv`);
    const text = await csv.text();
    // the default CSV is plain: the header row first, no comment lines a spreadsheet or survey import would choke on
    const header = 'id,block,role,set,view,pairId,magnitude,soonerAmount,soonerDelay,laterAmount,laterDelay,soonerSide,position,text';
    expect(text.split('\r\n')[0]).toBe(header);
    expect(text).not.toMatch(/^#/m);
    const rows = text.trimEnd().split('\r\n').length - 1;

    // its metadata sidecar names the CSV, the hash, the seed and every column
    const meta = await exportBank(await requestAs(team.operator, 'GET', `/api/studies/${study.id}/item-bank/${version.id}/export?format=metadata&seed=42&delayUnit=weeks`), params);
    expect(meta.headers.get('content-disposition')).toContain(`seed42.meta.json`);
    const sidecar = (await meta.json()) as { describes: string; itemCount: number; columns: Record<string, string>; header: { seed: number; designVersion: { hash: string } }; items?: unknown };
    expect(sidecar.describes).toBe(`switchback-items-${study.id}-export-study-${version.hash.slice(0, 12)}-seed42.csv`);
    expect(sidecar.itemCount).toBe(rows);
    expect(sidecar.header).toMatchObject({ seed: 42, designVersion: { hash: version.hash } });
    expect(Object.keys(sidecar.columns).join(',')).toBe(header);
    expect(sidecar.items).toBeUndefined();

    // the annotated CSV keeps the comment lines for readers that skip them
    const annotated = await (await exportBank(await requestAs(team.operator, 'GET', `/api/studies/${study.id}/item-bank/${version.id}/export?format=csv-annotated&seed=42&delayUnit=weeks`), params)).text();
    expect(annotated).toContain(`hash ${version.hash} · seed 42`);
    expect(annotated.split('\r\n').find((l) => !l.startsWith('#'))).toBe(header);

    const json = await exportBank(await requestAs(team.owner, 'GET', `/api/studies/${study.id}/item-bank/${version.id}/export?format=json`), params);
    const body = (await json.json()) as { header: { seed: number; designVersion: { hash: string } }; items: unknown[] };
    expect(body.header.designVersion.hash).toBe(version.hash);
    expect(body.header.seed).toBe(parseInt(version.hash.slice(0, 8), 16));

    const events = await AuditEvent.findAll({ where: { studyId: study.id, action: 'item-bank.export' }, order: [['id', 'ASC']] });
    expect(events.map((e) => [e.actorId, e.details.format, e.details.seed])).toEqual([
      [team.operator.id, 'csv', 42],
      [team.operator.id, 'metadata', 42],
      [team.operator.id, 'csv-annotated', 42],
      [team.owner.id, 'json', body.header.seed],
    ]);
  });

  it('refuses viewers, names bad options, and does not find another study\'s version', async () => {
    const { study, team } = await makeStudyWithTeam('Export refusals');
    const other = await makeStudyWithTeam('Export other');
    const version = await makeFrozenVersion(study.id);
    const foreign = await makeFrozenVersion(other.study.id);
    const at = (v: number) => ctx({ id: String(study.id), versionId: String(v) });
    expect((await exportBank(await requestAs(team.viewer, 'GET', `/api/studies/${study.id}/item-bank/${version.id}/export`), at(version.id))).status).toBe(403);
    const bad = await preview(await requestAs(team.operator, 'GET', `/api/studies/${study.id}/item-bank/${version.id}?delayUnit=fortnights&minGap=0`), at(version.id));
    expect(bad.status).toBe(422);
    const paths = ((await bad.json()) as { issues: Array<{ path: string }> }).issues.map((i) => i.path);
    expect(paths).toEqual(expect.arrayContaining(['delayUnit', 'minGap']));
    expect((await preview(await requestAs(team.operator, 'GET', `/api/studies/${study.id}/item-bank/${foreign.id}`), at(foreign.id))).status).toBe(404);
    expect(await AuditEvent.count({ where: { studyId: study.id, action: 'item-bank.export' } })).toBe(0);
  });

  it('names the model-discrimination criterion and its reversal weight in the export, with probes where the criterion puts them', async () => {
    const { study, team } = await makeStudyWithTeam('Discrimination study');
    const version = await makeFrozenVersion(study.id, demoContent({ criterion: 'model-discrimination', reversalWeight: 0.5 }));
    const json = await exportBank(await requestAs(team.operator, 'GET', `/api/studies/${study.id}/item-bank/${version.id}/export?format=json&seed=7`), ctx({ id: String(study.id), versionId: String(version.id) }));
    expect(json.status).toBe(200);
    const body = (await json.json()) as { header: { probeCriterion: { name: string; reversalWeight: number | null } }; notes: string[]; designPoint: { soonDelay: number; lateDelay: number; kSmall: number; kLarge: number } };
    expect(body.header.probeCriterion).toEqual({ name: 'model-discrimination', reversalWeight: 0.5 });
    expect(body.notes.join(' ')).toMatch(/model discrimination.*Kullback–Leibler.*0\.5 ×/);
    // the design point is the criterion's optimum at the medians, not the gap product's
    const { designPoint: p } = body;
    const content = demoContent({ criterion: 'model-discrimination', reversalWeight: 0.5 });
    const choice = { sensitivity: content.spec.choiceSensitivity ?? 10 };
    const at = (D: number) => modelDiscrimination({ model: content.spec.model, ratio: content.spec.ratio, soonDelay: p.soonDelay, lateDelay: D, kSmall: p.kSmall, kLarge: p.kLarge, choice, reversalWeight: 0.5 }).value;
    for (const factor of [0.8, 0.95, 1.05, 1.25]) expect(at(p.lateDelay)).toBeGreaterThanOrEqual(at(p.soonDelay + (p.lateDelay - p.soonDelay) * factor));

    const plain = await makeFrozenVersion(study.id, demoContent({ name: 'Plain' }));
    const other = (await (await exportBank(await requestAs(team.operator, 'GET', `/api/studies/${study.id}/item-bank/${plain.id}/export?format=json&seed=7`), ctx({ id: String(study.id), versionId: String(plain.id) }))).json()) as { header: { probeCriterion: unknown } };
    expect(other.header.probeCriterion).toEqual({ name: demoContent().spec.criterion, reversalWeight: null });
  });
});
