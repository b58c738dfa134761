import { ValidationError } from '../../lib/errors';
import { defineRoute } from '../../routing/route';
import { findStack, listChannels } from './imports.repo';
import {
  CommitBody,
  CommitResultDto,
  ImportDraftDto,
  ImportList,
  ImportListQuery,
  ImportParams,
  MappingBody,
  PreviewDto,
  ProgressDto,
  RollbackBody,
  RollbackResultDto,
  StackParams,
  UploadFields,
} from './imports.schemas';
import * as imports from './imports.service';
import { receiveUpload } from './imports.upload';
import { writeProblemsWorkbook, writeTemplateWorkbook } from './workbooks';

const xlsxType = 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet';

function attachment(name: string): string {
  const ascii = name.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_');
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(name)}`;
}

export const importsRoutes = [
  defineRoute({
    method: 'post',
    path: '/api/stacks/:stackId/imports',
    permission: 'data:import',
    summary: 'Upload a stack data file (.xlsx or .csv) and parse it into a draft import',
    params: StackParams,
    response: ImportDraftDto,
    status: 201,
    handler: async ({ ctx, params, req, res, services }) => {
      // The stack is checked before the body is read: a wrong id costs no upload.
      await findStack(ctx, params.stackId);
      const received = await receiveUpload(req, res, services.env.IMPORT_MAX_BYTES);
      const fields = UploadFields.safeParse(received.fields);
      if (!fields.success) throw ValidationError.fromZod('body', fields.error);
      return imports.upload(ctx, params.stackId, { originalName: received.originalName, bytes: received.bytes }, fields.data);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/stacks/:stackId/imports',
    permission: 'data:read',
    summary: "A stack's imports, newest first",
    params: StackParams,
    query: ImportListQuery,
    response: ImportList,
    handler: ({ ctx, params, query }) => imports.list(ctx, params.stackId, query.limit, query.offset),
  }),
  defineRoute({
    method: 'get',
    path: '/api/stacks/:stackId/template.xlsx',
    permission: 'data:read',
    summary: 'Example workbook for a stack: a timestamp column and one column per channel',
    params: StackParams,
    response: 'raw',
    handler: async ({ ctx, params, res }) => {
      const stack = await findStack(ctx, params.stackId);
      const channels = (await listChannels(ctx, params.stackId)).filter((c) => !c.archivedAt);
      res.setHeader('Content-Type', xlsxType);
      res.setHeader('Content-Disposition', attachment(`${stack.name}-example.xlsx`));
      await writeTemplateWorkbook(res, stack, channels);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/imports/:importId',
    permission: 'data:read',
    summary: 'An import: file, columns with suggested and chosen channels, counts and progress',
    params: ImportParams,
    response: ImportDraftDto,
    handler: ({ ctx, params }) => imports.getDraft(ctx, params.importId),
  }),
  defineRoute({
    method: 'get',
    path: '/api/imports/:importId/progress',
    permission: 'data:read',
    summary: 'Where a running commit is',
    params: ImportParams,
    response: ProgressDto,
    handler: ({ ctx, params }) => imports.progress(ctx, params.importId),
  }),
  defineRoute({
    method: 'put',
    path: '/api/imports/:importId/mapping',
    permission: 'data:import',
    summary: 'Choose the timestamp column, interval convention and the channel of each column',
    params: ImportParams,
    body: MappingBody,
    response: ImportDraftDto,
    handler: ({ ctx, params, body }) => imports.setMapping(ctx, params.importId, body),
  }),
  defineRoute({
    method: 'get',
    path: '/api/imports/:importId/preview',
    permission: 'data:read',
    summary: 'Sample rows, every problem, totals per channel, span, gaps, duplicates and overlap with stored data',
    params: ImportParams,
    response: PreviewDto,
    handler: ({ ctx, params }) => imports.preview(ctx, params.importId),
  }),
  defineRoute({
    method: 'get',
    path: '/api/imports/:importId/problems.xlsx',
    permission: 'data:read',
    summary: 'Every problem of an import as a workbook',
    params: ImportParams,
    response: 'raw',
    handler: async ({ ctx, params, res }) => {
      const { row, problems } = await imports.allProblems(ctx, params.importId);
      res.setHeader('Content-Type', xlsxType);
      res.setHeader('Content-Disposition', attachment(`${row.file_name.replace(/\.(xlsx|csv)$/i, '')}-problems.xlsx`));
      await writeProblemsWorkbook(res, row.file_name, problems);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/imports/:importId/commit',
    permission: 'data:import',
    summary: 'Store the readings, all or nothing; conflicts are replaced only when asked, with a reason',
    params: ImportParams,
    body: CommitBody,
    response: CommitResultDto,
    handler: ({ ctx, params, body, services }) => imports.commit(ctx, { pool: services.db }, params.importId, body),
  }),
  defineRoute({
    method: 'post',
    path: '/api/imports/:importId/rollback',
    permission: 'data:import',
    summary: "Withdraw a committed import's readings (superseded, not deleted) and restore what they replaced",
    params: ImportParams,
    body: RollbackBody,
    response: RollbackResultDto,
    handler: ({ ctx, params, body }) => imports.rollback(ctx, params.importId, body.reason),
  }),
];
