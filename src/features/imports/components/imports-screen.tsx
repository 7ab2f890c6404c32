import type { ImportUploadResponse } from '@shared/schemas/imports.schema';
import { useState } from 'react';
import { ExportsPanel } from './exports-panel';
import { ImportSession } from './import-session';
import { UploadCard } from './upload-card';

/** Bring kit, lab and meter results in from a CSV file; take readings and results out as CSV. */
export function ImportsScreen({ farmId, timeZone }: { farmId: string; timeZone: string }) {
  const [upload, setUpload] = useState<ImportUploadResponse | null>(null);
  return (
    <div className="flex flex-col gap-6" data-testid="imports">
      {upload ? (
        <ImportSession key={upload.importId} farmId={farmId} upload={upload} onDone={() => setUpload(null)} />
      ) : (
        <UploadCard farmId={farmId} onUploaded={setUpload} />
      )}
      <ExportsPanel farmId={farmId} timeZone={timeZone} />
    </div>
  );
}
