import { createHash } from 'node:crypto';
import type { Request } from 'express';
import { z } from 'zod';
import type { Role } from '../../../shared/schemas/auth.schema';
import {
  importCommitRequestSchema,
  importStatusQuerySchema,
  importStatusSchema,
  importUploadJsonSchema,
  importUploadResponseSchema,
  importValidateRequestSchema,
} from '../../../shared/schemas/imports.schema';
import type { Authenticator } from '../../http/build-router';
import { badRequest } from '../../http/errors';
import { defineRoute, farmParams, farmRoles, type RouteDef } from '../../http/route-registry';
import { importUpload, type UploadedFile } from './import-upload';
import { presentStatus, presentUpload } from './imports.presenter';
import type { ImportsService } from './imports.service';
import { importIdFor } from './row-check';

const IMPORT_ROLES: Role[] = ['planner', 'manager', 'admin'];
const importParams = farmParams.extend({ importId: z.uuid() });

/** The file the route × role test uploads (as JSON) and then validates and commits. */
const EXAMPLE_CSV = 'unit,sampled_at,analyte,method,basis,value,note\nP1,2024-01-15T08:00:00Z,total_ammonia,salicylate,tan-n,0.4,route example\n';
const EXAMPLE_MAPPING = {
  unitCode: 'unit',
  sampledAt: { column: 'sampled_at' },
  analyte: { column: 'analyte' },
  method: { column: 'method' },
  basis: { column: 'basis' },
  value: 'value',
  note: 'note',
};
const exampleImportId = (farmId: string) => importIdFor(farmId, createHash('sha256').update(EXAMPLE_CSV).digest('hex'));

export function importRoutes(imports: ImportsService, auth: Pick<Authenticator, 'authenticate'>): RouteDef[] {
  return [
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/imports',
      summary:
        'Upload a CSV of kit results, lab results or meter logs (multipart field "file", ≤ 20 MB, UTF-8; or JSON { fileName, csv } for pasted text). ' +
        'Answers the headers, the first 20 rows and a suggested column mapping. The same file uploaded again returns the same import (200).',
      tags: ['imports'],
      access: farmRoles(...IMPORT_ROLES),
      params: farmParams,
      body: importUploadJsonSchema,
      response: importUploadResponseSchema,
      before: [importUpload({ auth, roles: IMPORT_ROLES, dir: imports.incomingDir })],
      example: (f) => ({ params: { farmId: f.farmId! }, body: { fileName: 'route-example.csv', csv: EXAMPLE_CSV } }),
      handler: async ({ params, body, user, req }) => {
        const file = (req as Request & { file?: UploadedFile }).file;
        const userId = user?.id ?? null;
        let result;
        if (file) result = await imports.uploadFile(params.farmId, userId, { path: file.path, fileName: file.originalname });
        else if (body.csv) result = await imports.uploadText(params.farmId, userId, body.fileName ?? 'pasted.csv', body.csv);
        else throw badRequest('Attach the CSV file as the multipart form field "file".', undefined, 'file_missing');
        return { status: result.existing ? 200 : 201, body: presentUpload(result) };
      },
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/imports/:importId/validate',
      summary:
        'Check every row with a column mapping (the water-test schema plus the unit code). Answers 200 with counts and rejected rows when done, ' +
        'or 202 with state "validating" for a large file: poll GET …/imports/:importId.',
      tags: ['imports'],
      access: farmRoles(...IMPORT_ROLES),
      params: importParams,
      body: importValidateRequestSchema,
      response: importStatusSchema,
      example: (f) => ({ params: { farmId: f.farmId!, importId: exampleImportId(f.farmId!) }, body: { mapping: EXAMPLE_MAPPING } }),
      handler: async ({ params, body }) => {
        const status = presentStatus(await imports.validate(params.farmId, params.importId, body.mapping));
        return { status: status.state === 'validating' ? 202 : 200, body: status };
      },
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/imports/:importId/commit',
      summary:
        'Store the rows in one transaction, in the background (202; poll GET …/imports/:importId). Refused while any row is rejected unless skipRejected is true. ' +
        'Re-running a commit stores each line once; total-ammonia rows are queued for the free-ammonia computation.',
      tags: ['imports'],
      access: farmRoles(...IMPORT_ROLES),
      params: importParams,
      body: importCommitRequestSchema,
      response: importStatusSchema,
      example: (f) => ({ params: { farmId: f.farmId!, importId: exampleImportId(f.farmId!) }, body: { mapping: EXAMPLE_MAPPING } }),
      handler: async ({ params, body, user }) => ({
        status: 202,
        body: presentStatus(await imports.commit(params.farmId, params.importId, body, user?.id ?? null)),
      }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/imports/:importId',
      summary: 'State and progress of an import (processedRows grows while it runs), its rejected rows (paged) and the commit report.',
      tags: ['imports'],
      access: farmRoles(...IMPORT_ROLES),
      params: importParams,
      query: importStatusQuerySchema,
      response: importStatusSchema,
      example: (f) => ({ params: { farmId: f.farmId!, importId: exampleImportId(f.farmId!) } }),
      handler: async ({ params, query }) => ({
        body: presentStatus(await imports.status(params.farmId, params.importId, { offset: query.rejectsOffset, limit: query.rejectsLimit })),
      }),
    }),
  ];
}
