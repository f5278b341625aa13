import { useId, useState, type DragEvent } from 'react';

/** A file field that also takes a dropped file. */
export default function DropZone({
  inputId,
  label,
  hint,
  accept,
  file,
  onFile,
  large = false,
  testId,
}: {
  inputId: string;
  label: string;
  hint: string;
  accept: string;
  file: File | null;
  onFile: (file: File | null, others: File[]) => void;
  large?: boolean;
  testId: string;
}) {
  const [over, setOver] = useState(false);
  const hintId = useId();

  function drop(event: DragEvent<HTMLDivElement>) {
    event.preventDefault();
    setOver(false);
    const files = [...event.dataTransfer.files];
    if (files.length > 0) onFile(files[0], files.slice(1));
  }

  const size = !file ? '' : file.size >= 1024 * 1024 ? `${(file.size / (1024 * 1024)).toFixed(1)} MiB` : file.size >= 1024 ? `${Math.round(file.size / 1024)} KiB` : `${file.size} bytes`;
  return (
    <div
      data-testid={testId}
      onDragEnter={(event) => {
        event.preventDefault();
        setOver(true);
      }}
      onDragOver={(event) => {
        event.preventDefault();
        event.dataTransfer.dropEffect = 'copy';
      }}
      onDragLeave={() => setOver(false)}
      onDrop={drop}
      className={`rounded-md border-2 border-dashed text-center transition-colors ${large ? 'px-6 py-10' : 'px-4 py-5'} ${
        over ? 'border-spruce-600 bg-spruce-50' : file ? 'border-spruce-600 bg-card' : 'border-rule-strong bg-card'
      }`}
    >
      <p className={`font-semibold ${large ? 'text-lg' : ''}`}>{label}</p>
      {file ? (
        <p className="mt-1 text-sm" data-testid={`${testId}-chosen`}>
          <span className="font-semibold text-spruce-800">{file.name}</span> <span className="text-ink-soft">· {size}</span>{' '}
          <button type="button" className="ml-1 text-sm font-semibold text-spruce-700 underline" onClick={() => onFile(null, [])}>
            Remove
          </button>
        </p>
      ) : (
        <p className="mt-1 text-sm text-ink-soft" id={hintId}>
          {hint}
        </p>
      )}
      {/* The input stays in the tab order (visually hidden); its label, styled as a button, shows its focus. */}
      <input
        id={inputId}
        type="file"
        accept={accept}
        className="peer sr-only"
        aria-label={label}
        aria-describedby={file ? undefined : hintId}
        onChange={(event) => {
          const chosen = [...(event.currentTarget.files ?? [])];
          onFile(chosen[0] ?? null, chosen.slice(1));
          event.currentTarget.value = '';
        }}
      />
      <label
        htmlFor={inputId}
        className="button button-quiet mt-3 cursor-pointer peer-focus-visible:outline-2 peer-focus-visible:outline-offset-2 peer-focus-visible:outline-spruce-600"
      >
        {file ? 'Choose another file' : 'Choose a file'}
      </label>
    </div>
  );
}
