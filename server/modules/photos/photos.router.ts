import type { Request } from 'express';
import { z } from 'zod';
import { ANY_FARM_ROLE, defineRoute, farmParams, farmRoles, unitParams, type RouteDef } from '../../http/route-registry';
import { photoUpload } from './photo-upload';
import type { PhotosService } from './photos.service';

// A 1×1 PNG, so the route × role test can upload a real image.
const TINY_PNG = 'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==';
const fileOf = (req: Request) => (req as Request & { file?: { buffer: Buffer } }).file?.buffer;

export function photoRoutes(photos: PhotosService): RouteDef[] {
  return [
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/units/:unitId/observations/:observationId/photo',
      summary: 'Attach a photo (JPEG, PNG or WebP, at most 8 MB; multipart field "photo") to an observation.',
      tags: ['photos'],
      access: farmRoles('hand', 'manager', 'planner', 'admin'),
      params: unitParams.extend({ observationId: z.uuid() }),
      before: [photoUpload()],
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId!, observationId: f.observationId! }, upload: { field: 'photo', base64: TINY_PNG, name: 'x.png' } }),
      handler: async ({ params, req }) => ({ status: 201, body: await photos.attach(params.farmId, { kind: 'observation', unitId: params.unitId, id: params.observationId }, fileOf(req)) }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/units/:unitId/tests/:testId/photo',
      summary: 'Attach a photo of the kit tube or card to a kit result.',
      tags: ['photos'],
      access: farmRoles('hand', 'manager', 'admin'),
      params: unitParams.extend({ testId: z.uuid() }),
      before: [photoUpload()],
      example: (f) => ({ params: { farmId: f.farmId!, unitId: f.unitId!, testId: f.testId! }, upload: { field: 'photo', base64: TINY_PNG, name: 'x.png' } }),
      handler: async ({ params, req }) => ({ status: 201, body: await photos.attach(params.farmId, { kind: 'test', unitId: params.unitId, id: params.testId }, fileOf(req)) }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/photos/:name',
      summary: 'A stored photo of this farm.',
      tags: ['photos'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams.extend({ name: z.string().max(60) }),
      kind: 'raw',
      example: (f) => ({ params: { farmId: f.farmId!, name: f.photoName! } }),
      handler: async ({ params, res }) => {
        const { bytes, contentType } = await photos.read(params.farmId, params.name);
        res.setHeader('Content-Type', contentType);
        res.setHeader('Cache-Control', 'private, max-age=86400');
        res.setHeader('X-Content-Type-Options', 'nosniff');
        res.status(200).end(bytes);
        return undefined;
      },
    }),
  ];
}
