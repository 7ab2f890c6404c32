import { randomUUID } from 'node:crypto';
import { mkdir, readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { DataSource } from 'typeorm';
import { Observation, WaterTest } from '../../db/entities';
import { notFound, unsupportedMediaType } from '../../http/errors';
import { sniffImage } from './photo-upload';

const NAME = /^[0-9a-f-]{36}\.(jpg|png|webp)$/;
const TYPES = { jpg: 'image/jpeg', png: 'image/png', webp: 'image/webp' } as const;

/**
 * Photos of observations and kit results, stored under the data folder with server-made names
 * (`<uuid>.<ext>`; the client's file name is never used as a path).
 */
export class PhotosService {
  constructor(
    private readonly ds: DataSource,
    private readonly dir: string,
  ) {}

  private async store(bytes: Buffer): Promise<string> {
    const kind = sniffImage(bytes);
    if (!kind) throw unsupportedMediaType('The photo must be a JPEG, PNG or WebP image.');
    const name = `${randomUUID()}.${kind.ext}`;
    await mkdir(this.dir, { recursive: true });
    await writeFile(join(this.dir, name), bytes, { mode: 0o600 });
    return name;
  }

  async attach(farmId: string, target: { kind: 'observation' | 'test'; unitId: string; id: string }, bytes: Buffer | undefined): Promise<{ photoUrl: string }> {
    if (!bytes?.length) throw unsupportedMediaType('Attach the photo as the form field "photo".');
    const entity = target.kind === 'observation' ? Observation : WaterTest;
    const row = await this.ds.getRepository(entity).findOneBy({ id: target.id, farmId, unitId: target.unitId });
    if (!row) throw notFound(target.kind === 'observation' ? 'Observation' : 'Test');
    const name = await this.store(bytes);
    await this.ds.getRepository(entity).update({ id: target.id }, { photoPath: name });
    return { photoUrl: `/api/farms/${farmId}/photos/${name}` };
  }

  /** The photo's bytes, only if a row of this farm points at it. */
  async read(farmId: string, name: string): Promise<{ bytes: Buffer; contentType: string }> {
    if (!NAME.test(name)) throw notFound('Photo');
    const owned =
      (await this.ds.getRepository(Observation).existsBy({ farmId, photoPath: name })) || (await this.ds.getRepository(WaterTest).existsBy({ farmId, photoPath: name }));
    if (!owned) throw notFound('Photo');
    const ext = name.split('.').pop() as keyof typeof TYPES;
    try {
      return { bytes: await readFile(join(this.dir, name)), contentType: TYPES[ext] };
    } catch (err) {
      // The row survives a lost file (a restored backup without the data folder): say it is gone.
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') throw notFound('Photo');
      throw err;
    }
  }
}
