"use client";

import { useQuery, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { ScrollRegion } from "@/components/scroll-region";

interface StoredFile {
  id: number;
  filename: string;
  contentType: string;
  sizeBytes: number;
  sha256: string;
}

const MAX_BYTES = 25 * 1024 * 1024;

function size(bytes: number): string {
  return bytes >= 1024 * 1024 ? `${(bytes / 1024 / 1024).toFixed(1)} MB` : bytes >= 1024 ? `${(bytes / 1024).toFixed(0)} kB` : `${bytes} B`;
}

/** Sends one file with XMLHttpRequest, which (unlike fetch) reports upload progress. */
function uploadWithProgress(
  versionId: number,
  file: File,
  onProgress: (fraction: number) => void,
): Promise<{ ok: boolean; message?: string }> {
  return new Promise((resolve) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", `/api/v1/versions/${versionId}/files`);
    xhr.upload.onprogress = (e) => e.lengthComputable && onProgress(e.loaded / e.total);
    xhr.onload = () => {
      if (xhr.status === 201) return resolve({ ok: true });
      let message = `The server answered ${xhr.status}`;
      try {
        message = JSON.parse(xhr.responseText).title ?? message;
      } catch {
        /* keep the status line */
      }
      resolve({ ok: false, message });
    };
    xhr.onerror = () => resolve({ ok: false, message: "The upload was interrupted; nothing was stored. Try again." });
    const form = new FormData();
    form.set("file", file);
    xhr.send(form);
  });
}

/** Supplementary files of a version: list, upload with a progress bar, remove (drafts only). */
export function FilesPanel({ versionId, editable }: { versionId: number; editable: boolean }) {
  const client = useQueryClient();
  const [progress, setProgress] = useState<number | null>(null);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const files = useQuery<StoredFile[]>({
    queryKey: ["version-files", versionId],
    queryFn: async () => (await (await fetch(`/api/v1/versions/${versionId}/files`)).json()).data ?? [],
  });

  async function onPick(e: React.ChangeEvent<HTMLInputElement>) {
    const file = e.target.files?.[0];
    e.target.value = "";
    if (!file) return;
    setMessage(null);
    if (file.size > MAX_BYTES) return setMessage({ ok: false, text: `The file is ${size(file.size)}; the limit is 25 MB.` });
    setProgress(0);
    const result = await uploadWithProgress(versionId, file, setProgress);
    setProgress(null);
    setMessage(result.ok ? { ok: true, text: `${file.name} added.` } : { ok: false, text: result.message ?? "Upload failed" });
    await client.invalidateQueries({ queryKey: ["version-files", versionId] });
  }

  async function remove(f: StoredFile) {
    const res = await fetch(`/api/v1/files/${f.id}`, { method: "DELETE" });
    setMessage(
      res.ok
        ? { ok: true, text: `${f.filename} removed.` }
        : { ok: false, text: (await res.json().catch(() => ({}))).title ?? "Could not remove the file" },
    );
    await client.invalidateQueries({ queryKey: ["version-files", versionId] });
  }

  return (
    <section aria-labelledby="files-heading" className="card space-y-3">
      <h2 id="files-heading" className="font-serif text-xl font-semibold">
        Supplementary files
      </h2>
      <p className="text-sm text-muted">
        Raw data, input files of calculations, figures. Up to 25 MB each; the SHA-256 of every file is kept with the version.
      </p>
      {files.data && files.data.length > 0 ? (
        <ScrollRegion label="Files of this version">
          <table className="table">
            <thead>
              <tr>
                <th scope="col">File</th>
                <th scope="col">Size</th>
                <th scope="col">SHA-256</th>
                <th scope="col">
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {files.data.map((f) => (
                <tr key={f.id}>
                  <td>
                    <a href={`/api/v1/files/${f.id}`}>{f.filename}</a>
                  </td>
                  <td>{size(f.sizeBytes)}</td>
                  <td className="font-mono text-xs" title={f.sha256}>
                    {f.sha256.slice(0, 16)}…
                  </td>
                  <td>
                    {editable && (
                      <button type="button" className="btn-secondary py-1" onClick={() => remove(f)}>
                        Remove<span className="sr-only"> {f.filename}</span>
                      </button>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
      ) : (
        <p className="text-sm text-muted">{files.isPending ? "Loading…" : "No files."}</p>
      )}
      {editable && (
        <div className="space-y-2">
          <label htmlFor="supplementary-file" className="block text-sm font-medium">
            Add a file
          </label>
          <input id="supplementary-file" type="file" onChange={onPick} disabled={progress !== null} className="text-sm" />
          {progress !== null && (
            <div className="flex items-center gap-2 text-sm">
              <progress max={1} value={progress} aria-label="Upload progress" className="w-64" /> {Math.round(progress * 100)} %
            </div>
          )}
        </div>
      )}
      {message && (
        <p role={message.ok ? "status" : "alert"} className={`text-sm ${message.ok ? "text-ok" : "text-error"}`}>
          {message.text}
        </p>
      )}
    </section>
  );
}
