import { createHash } from 'node:crypto';
import type { Knex } from 'knex';
import { ApiClient } from '../../test-support/api-client';
import { createOrganisation, type TestOrganisation } from '../../test-support/fixtures';
import { createOwnerDb, createTestApp, type TestApp } from '../../test-support/test-app';
import { auditRows, buildSiteTree, type SiteTree } from '../sites/setup-fixtures';
import { MAX_PERMIT_DOCUMENT_BYTES } from './permits.schemas';

let t: TestApp;
let owner: Knex;
let org: TestOrganisation;
let tree: SiteTree;
let officer: ApiClient;
let auditor: ApiClient;

/** The smallest thing that starts like a PDF (ISO 32000-1 §7.5.2 header) — enough for the check. */
const pdf = Buffer.from('%PDF-1.7\n1 0 obj <<>> endobj\ntrailer <<>>\n%%EOF\n', 'latin1');

function upload(client: ApiClient, permitId: string, content: Buffer, fileName = 'permit.pdf', field = 'file') {
  let req = client.agent.put(`/api/permits/${permitId}/document`);
  if (client.csrfToken) req = req.set('X-XSRF-TOKEN', client.csrfToken);
  return req.attach(field, content, { filename: fileName, contentType: 'application/pdf' });
}

beforeAll(async () => {
  t = createTestApp();
  owner = createOwnerDb();
  org = await createOrganisation(owner);
  tree = await buildSiteTree(t.db, org, 'Permits Works');
  officer = await ApiClient.signedIn(t.app, org.users.officer.email, org.users.officer.password);
  auditor = await ApiClient.signedIn(t.app, org.users.auditor.email, org.users.auditor.password);
});

afterAll(async () => {
  await t.close();
  await owner.destroy();
});

describe('POST /api/sites/:siteId/permits', () => {
  it('adds a permit, audited', async () => {
    const res = await officer.post(`/api/sites/${tree.siteId}/permits`, { reference: 'P-2026-1', authority: 'District Office', effectiveFrom: '2026-01-01', effectiveTo: '2035-12-31' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ reference: 'P-2026-1', effectiveTo: '2035-12-31', document: null, version: 1 });
    expect((await auditRows(t.db, org, res.body.id))[0]).toMatchObject({ action: 'permit.created' });
  });

  it('responds 409 for a second live permit with the same reference on the site', async () => {
    const res = await officer.post(`/api/sites/${tree.siteId}/permits`, { reference: 'P-2026-1', authority: 'Other', effectiveFrom: '2026-01-01' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('permit_reference_exists');
  });

  it('responds 400 for an end before the start and an impossible date', async () => {
    const res = await officer.post(`/api/sites/${tree.siteId}/permits`, { reference: 'P-X', authority: 'A', effectiveFrom: '2026-01-01', effectiveTo: '2025-01-01' });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('effectiveTo');
    const bad = await officer.post(`/api/sites/${tree.siteId}/permits`, { reference: 'P-Y', authority: 'A', effectiveFrom: '2026-02-30' });
    expect(bad.status).toBe(400);
  });
});

describe('PATCH /api/permits/:permitId', () => {
  it('changes the permit; a stale version gets 409', async () => {
    const ok = await officer.patch(`/api/permits/${tree.permitId}`, { authority: 'Regional Authority', version: 1 });
    expect(ok.body).toMatchObject({ authority: 'Regional Authority', version: 2 });
    expect((await auditRows(t.db, org, tree.permitId)).at(-1)).toMatchObject({ action: 'permit.updated', before: { authority: 'Fixture Authority' }, after: { authority: 'Regional Authority' } });
    expect((await officer.patch(`/api/permits/${tree.permitId}`, { authority: 'Late', version: 1 })).status).toBe(409);
  });
});

describe('GET /api/permits/:permitId', () => {
  it('includes the limits with their summary', async () => {
    const res = await officer.get(`/api/permits/${tree.permitId}`);
    expect(res.body.limits).toEqual([expect.objectContaining({ id: tree.limitId, summary: expect.stringContaining('NOx ≤ 100 mg/Nm3') })]);
  });
});

describe('PUT /api/permits/:permitId/document', () => {
  it('accepts a PDF, stores its hash and serves it back', async () => {
    const res = await upload(officer, tree.permitId, pdf, 'Genehmigung ä.pdf');
    expect(res.status).toBe(200);
    const sha256 = createHash('sha256').update(pdf).digest('hex');
    expect(res.body.document).toMatchObject({ fileName: 'Genehmigung ä.pdf', sizeBytes: pdf.length, sha256 });
    const download = await auditor.agent.get(`/api/permits/${tree.permitId}/document`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(download.status).toBe(200);
    expect(download.headers['content-type']).toBe('application/pdf');
    expect(download.headers['content-disposition']).toContain("filename*=UTF-8''Genehmigung%20%C3%A4.pdf");
    expect(Buffer.compare(download.body as Buffer, pdf)).toBe(0);
    expect((await auditRows(t.db, org, tree.permitId)).at(-1)).toMatchObject({ action: 'permit.document_uploaded', after: { sha256 } });
  });

  it('replaces the current document and keeps the earlier one as history', async () => {
    const second = Buffer.concat([pdf, Buffer.from('% second edition\n')]);
    const res = await upload(officer, tree.permitId, second);
    expect(res.body.document.sizeBytes).toBe(second.length);
    const { rows } = await owner.raw('select count(*)::int as n, count(*) filter (where replaced_at is null)::int as current from permit_documents where permit_id = ?', [tree.permitId]);
    // FORCE RLS hides the rows from the owner without a tenant: count through the tenant scope instead
    expect(rows[0].n).toBe(0);
    const counts = await t.db.transaction(async (trx) => {
      await trx.raw("select set_config('app.tenant_id', ?, true)", [org.id]);
      return (await trx.raw('select count(*)::int as n, count(*) filter (where replaced_at is null)::int as current from permit_documents where permit_id = ?', [tree.permitId])).rows[0];
    });
    expect(counts).toEqual({ n: 2, current: 1 });
  });

  it('refuses a file that is not a PDF with 415, whatever its name says', async () => {
    const res = await upload(officer, tree.permitId, Buffer.from('PK\u0003\u0004 not a pdf'), 'permit.pdf');
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('unsupported_media_type');
  });

  it('refuses a file over 20 MB with 413', async () => {
    const big = Buffer.alloc(MAX_PERMIT_DOCUMENT_BYTES + 1, 0x20);
    pdf.copy(big);
    const res = await upload(officer, tree.permitId, big);
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('file_too_large');
  });

  it('responds 400 without a file', async () => {
    const res = await officer.put(`/api/permits/${tree.permitId}/document`, { file: 'nope' });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('file');
  });

  it('responds 403 to the auditor', async () => {
    expect((await upload(auditor, tree.permitId, pdf)).status).toBe(403);
  });
});

describe('POST /api/permits/:permitId/archive', () => {
  it('hides the permit from the list unless includeArchived=true', async () => {
    const p = (await officer.post(`/api/sites/${tree.siteId}/permits`, { reference: 'OLD-1', authority: 'A', effectiveFrom: '2000-01-01' })).body;
    await officer.post(`/api/permits/${p.id}/archive`, { version: 1 });
    expect((await officer.get(`/api/sites/${tree.siteId}/permits`)).body.items.map((x: { id: string }) => x.id)).not.toContain(p.id);
    expect((await officer.get(`/api/sites/${tree.siteId}/permits?includeArchived=true`)).body.items.map((x: { id: string }) => x.id)).toContain(p.id);
  });
});
