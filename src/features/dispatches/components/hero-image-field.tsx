import { useEffect, useId, useRef, useState } from 'react';
import { HERO_IMAGE_TYPES, heroAltSchema, type DispatchDetail } from '@shared/schemas/dispatch';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/text-field';
import { errorMessage } from '@/lib/form-errors';
import { useRemoveHero, useUploadHero } from '../api/upload-hero';

const megabytes = (bytes: number) => `${(bytes / 1024 / 1024).toFixed(1)} MB`;

/** What is wrong with a chosen file before it is sent; the server checks the bytes again whatever this says. */
function fileProblem(file: File, maxBytes: number): string | null {
  if (!(HERO_IMAGE_TYPES as readonly string[]).includes(file.type)) {
    return `"${file.name}" is ${file.type ? `a ${file.type} file` : 'not an image the browser recognises'}. Choose a PNG, JPEG, WebP or GIF image.`;
  }
  if (file.size > maxBytes) return `"${file.name}" is ${megabytes(file.size)}; the limit is ${megabytes(maxBytes)}. Export it smaller.`;
  return null;
}

/**
 * The dispatch's hero image: choose a file, see it, describe it, upload. The description is required (it is
 * the image's alt text on the site and in the e-mail).
 */
export function HeroImageField({
  dispatch,
  maxBytes,
  alt,
  onAltChange,
}: {
  dispatch: DispatchDetail;
  maxBytes: number;
  alt: string;
  onAltChange: (alt: string) => void;
}) {
  const inputId = useId();
  const fileInput = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [previewUrl, setPreviewUrl] = useState<string | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [altError, setAltError] = useState<string | undefined>();
  const upload = useUploadHero(dispatch.id);
  const remove = useRemoveHero(dispatch.id);

  useEffect(() => {
    if (!file) return setPreviewUrl(null);
    const url = URL.createObjectURL(file);
    setPreviewUrl(url);
    return () => URL.revokeObjectURL(url);
  }, [file]);

  const choose = (f: File | null) => {
    upload.reset();
    if (!f) {
      setFile(null);
      setProblem(null);
      return;
    }
    const why = fileProblem(f, maxBytes);
    setProblem(why);
    setFile(why ? null : f);
  };
  const send = () => {
    const parsed = heroAltSchema.safeParse(alt);
    if (!parsed.success) return setAltError(parsed.error.issues[0]!.message);
    setAltError(undefined);
    if (!file) return setProblem('Choose an image file first.');
    upload.mutate(
      { file, alt: parsed.data },
      {
        onSuccess: () => {
          setFile(null);
          if (fileInput.current) fileInput.current.value = '';
        },
      },
    );
  };

  const shown = previewUrl ?? dispatch.heroImagePath;
  return (
    <fieldset className="space-y-3 rounded-xl border border-foil-800 p-3">
      <legend className="px-1 font-semibold">Hero image</legend>
      {shown ? (
        <figure>
          <img src={shown} alt={alt} className="max-h-64 w-full rounded-lg bg-night-900 object-contain" data-testid="hero-preview" />
          <figcaption className="mt-1 text-sm text-foil-300">
            {previewUrl ? `Preview of ${file?.name ?? 'the chosen file'}: not uploaded yet.` : 'The current hero image.'}
          </figcaption>
        </figure>
      ) : (
        <p className="text-sm text-foil-300">No hero image. It shows above the text on the site and in the e-mail.</p>
      )}
      <div className="space-y-1.5">
        <label htmlFor={inputId} className="block text-sm font-semibold text-foil-100">
          Image file
        </label>
        <input
          id={inputId}
          ref={fileInput}
          type="file"
          accept={HERO_IMAGE_TYPES.join(',')}
          aria-describedby={`${inputId}-hint`}
          aria-invalid={problem ? true : undefined}
          className="block w-full text-sm text-foil-200 file:mr-3 file:rounded-lg file:border file:border-foil-500/70 file:bg-night-900 file:px-3 file:py-2 file:font-semibold file:text-foil-100"
          onChange={(e) => choose(e.target.files?.[0] ?? null)}
        />
        <p id={`${inputId}-hint`} className="text-sm text-foil-400">
          PNG, JPEG, WebP or GIF, up to {megabytes(maxBytes)}. SVG is not accepted.
        </p>
      </div>
      {problem && <Alert title="This file cannot be used">{problem}</Alert>}
      <TextField
        label="Image description (alt text)"
        hint="What the image shows, for readers who cannot see it. Required."
        value={alt}
        maxLength={300}
        error={altError}
        onChange={(e) => {
          onAltChange(e.target.value);
          if (altError) setAltError(undefined);
        }}
      />
      {upload.isError && <Alert title="The image was not uploaded">{errorMessage(upload.error)}</Alert>}
      {remove.isError && <Alert title="The image was not removed">{errorMessage(remove.error)}</Alert>}
      {upload.isSuccess && !file && (
        <Alert tone="success" title="Hero image uploaded">
          It is saved with the dispatch.
        </Alert>
      )}
      <div className="flex flex-wrap gap-2">
        <Button type="button" variant="secondary" disabled={!file} loading={upload.isPending} onClick={send}>
          Upload image
        </Button>
        {dispatch.heroImagePath && !file && (
          <Button type="button" variant="ghost" loading={remove.isPending} onClick={() => remove.mutate()}>
            Remove image
          </Button>
        )}
      </div>
    </fieldset>
  );
}
