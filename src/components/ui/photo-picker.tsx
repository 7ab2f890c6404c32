import { useEffect, useId, useState } from 'react';
import { Button, buttonClasses } from '@/components/ui/button';
import { Icon } from '@/components/ui/icon';

export interface PhotoPickerProps {
  file: File | null;
  onChange: (file: File | null) => void;
  label: string;
  hint: string;
  takeLabel: string;
  removeLabel: string;
  previewAlt: string;
}

/** One optional photo: the phone's camera opens straight away (capture), a preview shows what will be sent. */
export function PhotoPicker({ file, onChange, label, hint, takeLabel, removeLabel, previewAlt }: PhotoPickerProps) {
  const id = useId();
  const [url, setUrl] = useState<string | null>(null);
  useEffect(() => {
    if (!file || typeof URL.createObjectURL !== 'function') return setUrl(null);
    const u = URL.createObjectURL(file);
    setUrl(u);
    return () => URL.revokeObjectURL(u);
  }, [file]);

  return (
    <div className="flex flex-col gap-1.5" role="group" aria-labelledby={`${id}-label`}>
      <p id={`${id}-label`} className="text-base font-bold">
        {label}
      </p>
      {file ? (
        <div className="flex items-center gap-3">
          {url ? <img src={url} alt={previewAlt} className="size-24 rounded-xl border-2 border-line object-cover" /> : null}
          <Button variant="secondary" onClick={() => onChange(null)}>
            {removeLabel}
          </Button>
        </div>
      ) : (
        <label
          className={buttonClasses({ variant: 'secondary', className: 'self-start focus-within:outline-3 focus-within:outline-ember-400' })}
        >
          <input
            type="file"
            accept="image/jpeg,image/png,image/webp"
            capture="environment"
            className="sr-only"
            aria-describedby={`${id}-hint`}
            onChange={(e) => onChange(e.target.files?.[0] ?? null)}
          />
          <Icon name="upload" />
          {takeLabel}
        </label>
      )}
      <p id={`${id}-hint`} className="text-sm text-muted">
        {hint}
      </p>
    </div>
  );
}
