import { useId, useRef, useState, type FormEvent } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import type { Basemap } from '@shared/schemas/basemaps';
import { Button } from '@/components/ui/button';
import { FieldError, TextField } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { isApiError } from '@/lib/api-client';
import { describeError } from '@/lib/errors';
import { basemapKeys, uploadBasemap } from '../api';
import { formatBytes } from '../format';

/** Upload an MBTiles file with vector tiles; the server checks it and says why when it refuses it. */
export function UploadBasemapForm({ onUploaded }: { onUploaded: (basemap: Basemap) => void }) {
  const queryClient = useQueryClient();
  const fileId = useId();
  const inputRef = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [name, setName] = useState('');
  const [progress, setProgress] = useState<number | null>(null);
  const [fileError, setFileError] = useState<string | undefined>();
  const [formError, setFormError] = useState<string | undefined>();
  const abort = useRef<AbortController | null>(null);

  async function submit(e: FormEvent) {
    e.preventDefault();
    setFileError(undefined);
    setFormError(undefined);
    if (!file) {
      setFileError('Choose an MBTiles file');
      return;
    }
    abort.current = new AbortController();
    setProgress(0);
    try {
      const saved = await uploadBasemap(file, name, setProgress, abort.current.signal);
      await queryClient.invalidateQueries({ queryKey: basemapKeys.all });
      setFile(null);
      setName('');
      if (inputRef.current) inputRef.current.value = '';
      onUploaded(saved);
    } catch (error) {
      if (isApiError(error) && error.fields?.file) setFileError(error.fields.file);
      else if (!(isApiError(error) && error.code === 'ABORTED')) setFormError(describeError(error));
    } finally {
      setProgress(null);
      abort.current = null;
    }
  }

  const uploading = progress !== null;
  return (
    <form onSubmit={submit} noValidate className="space-y-4">
      <div className="space-y-1.5">
        <label htmlFor={fileId} className="block text-sm font-medium text-slate-800">
          MBTiles file
        </label>
        <input
          ref={inputRef}
          id={fileId}
          type="file"
          accept=".mbtiles,application/vnd.sqlite3,application/x-sqlite3"
          disabled={uploading}
          aria-invalid={fileError ? true : undefined}
          aria-describedby={`${fileId}-hint${fileError ? ` ${fileId}-error` : ''}`}
          className="block w-full text-sm text-slate-700 file:mr-3 file:rounded-md file:border-0 file:bg-slate-100 file:px-3 file:py-2 file:text-sm file:font-medium file:text-slate-800 hover:file:bg-slate-200"
          onChange={(ev) => {
            setFile(ev.target.files?.[0] ?? null);
            setFileError(undefined);
          }}
        />
        <p id={`${fileId}-hint`} className="text-xs text-slate-500">
          A vector MBTiles file (tiles in format pbf), for example one built with <code>npm run tiles</code> for your own region.
          {file ? ` Chosen: ${file.name}, ${formatBytes(file.size)}.` : ''}
        </p>
        <FieldError id={`${fileId}-error`} message={fileError} />
      </div>
      <TextField
        label="Name"
        hint="Optional: how the basemap is listed. Without one, the name in the file is used."
        value={name}
        maxLength={120}
        disabled={uploading}
        onChange={(ev) => setName(ev.target.value)}
      />
      {uploading ? (
        <div className="space-y-1">
          <div
            role="progressbar"
            aria-label="Upload progress"
            aria-valuemin={0}
            aria-valuemax={100}
            aria-valuenow={Math.round(progress * 100)}
            className="h-2 overflow-hidden rounded-full bg-slate-100"
          >
            <div className="h-full bg-accent-600 transition-[width]" style={{ width: `${Math.round(progress * 100)}%` }} />
          </div>
          <p className="text-xs text-slate-600">{progress < 1 ? `Uploading… ${Math.round(progress * 100)} %` : 'Checking the file…'}</p>
        </div>
      ) : null}
      <FormError message={formError} />
      <div className="flex flex-wrap gap-3">
        <Button type="submit" pending={uploading}>
          Upload basemap
        </Button>
        {uploading ? (
          <Button variant="ghost" onClick={() => abort.current?.abort()}>
            Cancel upload
          </Button>
        ) : null}
      </div>
    </form>
  );
}
