import { useId, useRef, useState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";

export type FileUploadProps = {
  label: string;
  accept: string;
  hint: string;
  pending: boolean;
  error: unknown;
  success: string | null;
  onUpload: (file: File) => void;
};

/** A labelled file picker with an upload button and the server's answer (e.g. "line 4: value: …"). */
export function FileUpload({ label, accept, hint, pending, error, success, onUpload }: FileUploadProps) {
  const id = useId();
  const input = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<File | null>(null);
  return (
    <div className="flex flex-col gap-2">
      <label htmlFor={id} className="text-sm font-semibold text-paper-200">
        {label}
      </label>
      <div className="flex flex-wrap items-center gap-2">
        <input
          id={id}
          ref={input}
          type="file"
          accept={accept}
          aria-describedby={`${id}-hint`}
          className="text-xs text-paper-200 file:mr-3 file:rounded file:border file:border-ink-600 file:bg-ink-800 file:px-3 file:py-1.5 file:text-paper-100"
          onChange={(e) => setFile(e.target.files?.[0] ?? null)}
        />
        <Button
          size="sm"
          variant="secondary"
          disabled={!file}
          pending={pending}
          onClick={() => {
            if (file) onUpload(file);
          }}
        >
          Upload
        </Button>
      </div>
      <p id={`${id}-hint`} className="text-xs text-ink-300">
        {hint}
      </p>
      {error instanceof Error && <Alert tone="error">{error.message}</Alert>}
      {success && <Alert tone="success">{success}</Alert>}
    </div>
  );
}
