import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import ExcelJS from 'exceljs';
import { randomBytes } from 'node:crypto';
import { closeTestKnex, testKnex } from '../support/db';
import { REPORT_MAIL_LIMIT } from '../../api/features/campaigns/routes';
import { binaryBody, signIn, signInEach, startAuthApp, type AuthTestApp, type SignedInRequests } from '../support/auth';
import { createUser } from '../factories/users';
import { createProject } from '../factories/projects';
import type { User } from '../../api/models/user';
import type { Project } from '../../api/models/project';

type Who = 'editor' | 'viewer' | 'outsider';

let env: AuthTestApp;
let users: Record<Who, User>;
let project: Project;
let as: (who: Who) => SignedInRequests;

// Exact SI: R = N_A·k_B (CODATA 2018 [S]).
const R = 6.02214076e23 * 1.380649e-23;

beforeAll(async () => {
  env = await startAuthApp({ smtpSink: true });
  users = { editor: await createUser(), viewer: await createUser(), outsider: await createUser() };
  project = await createProject([
    { user: users.editor, role: 'editor' },
    { user: users.viewer, role: 'viewer' },
  ]);
  as = await signInEach(env.app, users);
});

afterAll(async () => {
  await env?.close();
  await closeTestKnex();
});

/** A dr screen from ΔΔH‡ = 10 kJ/mol, ΔΔS‡ = 6 J/(mol·K) [C], nudged ±0.03 in ln r, at five temperatures. */
async function drScreen() {
  const res = await as('editor')
    .post(`/api/v1/projects/${project.id}/campaigns`)
    .send({
      title: `=Report screen ${randomBytes(3).toString('hex')}`,
      productNameA: 'syn',
      productNameB: 'anti',
      measure: 'dr',
      assayMethod: 'nmr',
      defaultUncertainty: 0.05,
    });
  expect(res.status).toBe(201);
  const id = res.body.id as string;
  for (const [i, c] of [-60, -40, -20, 0, 20].entries()) {
    const lnR = 10_000 / (R * (c + 273.15)) - 6 / R + (i % 2 ? 0.03 : -0.03);
    const dr = `${Math.round(Math.exp(lnR) * 10) / 10}:1`;
    await as('editor')
      .post(`/api/v1/campaigns/${id}/measurements`)
      .send({ temperature: { value: c, unit: 'C' }, selectivity: { measure: 'dr', value: dr }, sampleId: i === 0 ? '+SUM(1)' : `RS-${i}` })
      .expect(201);
  }
  return id;
}

describe('campaign exports', () => {
  it('when a viewer downloads the workbook at a chosen temperature, then its summary forecast equals the analysis there', async () => {
    const id = await drScreen();
    const analysis = (await as('viewer').get(`/api/v1/campaigns/${id}/analysis?at=-30`).expect(200)).body;
    const res = await as('viewer').get(`/api/v1/campaigns/${id}/report.xlsx?at=-30`).buffer(true).parse(binaryBody).expect(200);
    // The title starts with "=": the file name keeps letters, digits and dashes only.
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="?eyrie-Report-screen-[0-9a-f]{6}-report\.xlsx"?$/);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(res.body as unknown as ArrayBuffer);
    const ref = wb.definedNames.getRanges('Forecast_ratio').ranges[0]!.split('!')[1]!.replace(/\$/g, '');
    expect(wb.getWorksheet('Summary')!.getCell(ref).value).toBe(analysis.at.ratio);
    const ddH = wb.definedNames.getRanges('ddH_kJ_per_mol').ranges[0]!.split('!')[1]!.replace(/\$/g, '');
    expect(wb.getWorksheet('Summary')!.getCell(ddH).value).toBe(analysis.fit.ddH['kJ/mol']);
    let exportedBy: unknown;
    let title: unknown;
    wb.getWorksheet('Summary')!.eachRow((row) => {
      if (row.getCell(1).value === 'Exported by') exportedBy = row.getCell(2).value;
      if (row.getCell(1).value === 'Campaign') title = row.getCell(2).value;
    });
    expect(exportedBy).toBe(users.viewer.displayName ?? users.viewer.login);
    expect(String(title).startsWith("'=Report screen")).toBe(true);
    expect(wb.getWorksheet('Measurements')!.getRow(2).getCell(1).value).toBe("'+SUM(1)");
  });

  it('when the campaign has a stored specification, then the workbook states it and judges each forecast row against it', async () => {
    const id = await drScreen();
    await as('editor').put(`/api/v1/campaigns/${id}/specification`).send({ measure: 'dr', minimum: 12, probability: 0.9 }).expect(200);
    const res = await as('viewer').get(`/api/v1/campaigns/${id}/report.xlsx?at=-30`).buffer(true).parse(binaryBody).expect(200);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(res.body as unknown as ArrayBuffer);
    let spec: unknown;
    wb.getWorksheet('Summary')!.eachRow((row) => {
      if (row.getCell(1).value === 'Specification') spec = row.getCell(2).value;
    });
    expect(spec).toBe("dr ≥ 12.0:1, with probability 0.9 that a new run meets it (the campaign's own)");
    const fc = wb.getWorksheet('Forecast')!;
    const header = Array.from(fc.getRow(1).values as unknown[], String);
    const col = header.findIndex((h) => h.startsWith('Meets specification'));
    const ratioCol = header.findIndex((h) => h.startsWith('dr A:B'));
    expect(col).toBeGreaterThan(0);
    expect(ratioCol).toBeGreaterThan(0);
    fc.eachRow((row, i) => {
      if (i === 1) return;
      const ratio = row.getCell(ratioCol).value as number;
      // A forecast below 12:1 falls short; at or above it meets (with or without its whole interval) [C].
      expect(String(row.getCell(col).value)).toMatch(ratio < 12 ? /^falls short$/ : /meets/);
    });
  });

  it('when a viewer asks for the PDF and the CSVs, then each arrives with its type and content', async () => {
    const id = await drScreen();
    const pdf = await as('viewer').get(`/api/v1/campaigns/${id}/report.pdf`).buffer(true).parse(binaryBody).expect(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    expect((pdf.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');
    const m = await as('viewer').get(`/api/v1/campaigns/${id}/measurements.csv`).expect(200);
    expect(m.headers['content-type']).toMatch(/^text\/csv/);
    expect(m.text.split('\r\n')[0]).toContain('dr A:B');
    expect(m.text).toContain("'+SUM(1)");
    const f = await as('viewer').get(`/api/v1/campaigns/${id}/forecast.csv?at=-35`).expect(200);
    const rows = f.text.trim().split('\r\n').slice(1);
    // Every 5 °C from −60 to 20 °C plus the asked temperature [C].
    expect(rows.filter((r) => r.includes(',grid,'))).toHaveLength(17);
    expect(rows.filter((r) => r.includes(',proposed,'))[0]).toMatch(/^-35\.00,238\.15,proposed,/);
    const bad = await as('viewer').get(`/api/v1/campaigns/${id}/forecast.csv?at=-300`);
    expect(bad.status).toBe(400);
    expect(bad.body.errors[0].path).toBe('at');
  });

  it('when a viewer e-mails the report to a member, then the message with both files arrives in the sink', async () => {
    const id = await drScreen();
    const res = await as('viewer')
      .post(`/api/v1/campaigns/${id}/report/email`)
      .send({ recipients: [users.editor.id], message: 'For Monday.' })
      .expect(200);
    expect(res.body.sentTo).toEqual([{ userId: users.editor.id, email: users.editor.email }]);
    let mail = env.mailbox.list().find((m) => m.to.includes(users.editor.email!) && m.subject.includes('Report screen'));
    for (let i = 0; !mail && i < 50; i++) {
      await new Promise((r) => setTimeout(r, 50));
      mail = env.mailbox.list().find((m) => m.to.includes(users.editor.email!) && m.subject.includes('Report screen'));
    }
    expect(mail).toBeDefined();
    expect(mail!.text).toContain('For Monday.');
    expect(mail!.text).toContain('process-safety');
    expect(mail!.attachments.map((a) => a.filename)).toEqual([
      expect.stringMatching(/-report\.xlsx$/),
      expect.stringMatching(/-summary\.pdf$/),
    ]);
    const xlsx = env.mailbox.attachment(mail!, 0)!;
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(xlsx as unknown as ArrayBuffer);
    expect(wb.worksheets[0]!.name).toBe('Summary');
    expect(env.mailbox.attachment(mail!, 1)!.subarray(0, 5).toString()).toBe('%PDF-');
  });

  it('when a recipient is not a member, then nothing is sent and the error names the recipient', async () => {
    const id = await drScreen();
    const before = env.mailbox.list().length;
    const res = await as('viewer')
      .post(`/api/v1/campaigns/${id}/report/email`)
      .send({ recipients: [users.editor.id, users.outsider.id] });
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([{ path: 'recipients.1', message: 'is not a member of this project' }]);
    const empty = await as('viewer')
      .post(`/api/v1/campaigns/${id}/report/email`)
      .send({ recipients: [], attach: ['docx'] });
    expect(empty.status).toBe(400);
    expect(empty.body.errors.map((e: { path: string }) => e.path).sort()).toEqual(['attach.0', 'recipients']);
    expect(env.mailbox.list().length).toBe(before);
  });

  it('when one person sends more report e-mails than the window allows, then the next is 429', async () => {
    const id = await drScreen();
    const sender = await createUser();
    await testKnex()('projectMembers').insert({ projectId: project.id, userId: sender.id, role: 'viewer' });
    const s = await signIn(env.app, { login: sender.login, name: sender.displayName ?? sender.login, email: sender.email! });
    const send = () => s.agent.post(`/api/v1/campaigns/${id}/report/email`).set('X-CSRF-Token', s.csrfToken).send({ recipients: [] });
    for (let i = 0; i < REPORT_MAIL_LIMIT.limit; i++) expect((await send()).status).toBe(400);
    const limited = await send();
    expect(limited.status).toBe(429);
    expect(limited.body.detail).toContain('report e-mail');
  });

  it('when an outsider asks for any export, then it is 404', async () => {
    const id = await drScreen();
    for (const url of ['report.pdf', 'measurements.csv', 'forecast.csv'])
      expect((await as('outsider').get(`/api/v1/campaigns/${id}/${url}`)).status).toBe(404);
    expect(
      (
        await as('outsider')
          .post(`/api/v1/campaigns/${id}/report/email`)
          .send({ recipients: [users.editor.id] })
      ).status,
    ).toBe(404);
  });
});
