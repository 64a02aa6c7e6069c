import { useId, useRef, type ChangeEvent, type JSX } from "react";

// Photos straight from the phone's camera: each is uploaded as soon as it is taken (the
// uploads route checks the content, makes a thumbnail and keeps it private to the
// organisation), then attached to the reading set by the set's one save.

export interface Photo {
  key: string;
  cylinderNo: number | null;
  name: string;
  previewUrl: string;
  status: "uploading" | "done" | "failed";
  uploadId: number | null;
  message: string;
}

interface Props {
  engineId: number;
  cylinderNo: number | null;
  photos: Photo[];
  onPhotos: (update: (photos: Photo[]) => Photo[]) => void;
}

let counter = 0;

async function sendPhoto(file: File, engineId: number, cylinderNo: number | null): Promise<{ id: number }> {
  const form = new FormData();
  form.append("engineId", String(engineId));
  if (cylinderNo !== null) form.append("cylinderNo", String(cylinderNo));
  form.append("file", file, file.name || "photo.jpg");
  const res = await fetch("/api/v1/uploads", { method: "POST", body: form });
  const body = (await res.json().catch(() => null)) as { upload?: { id: number }; error?: { message?: string } } | null;
  if (!res.ok || !body?.upload) throw new Error(body?.error?.message ?? `The server answered ${res.status}.`);
  return body.upload;
}

export default function PhotoPicker({ engineId, cylinderNo, photos, onPhotos }: Props): JSX.Element {
  const id = useId();
  const input = useRef<HTMLInputElement>(null);
  const mine = photos.filter((p) => p.cylinderNo === cylinderNo);

  function picked(e: ChangeEvent<HTMLInputElement>): void {
    const files = [...(e.target.files ?? [])];
    e.target.value = "";
    for (const file of files) {
      counter += 1;
      const key = `photo-${counter}`;
      const photo: Photo = { key, cylinderNo, name: file.name, previewUrl: URL.createObjectURL(file), status: "uploading", uploadId: null, message: "" };
      onPhotos((list) => [...list, photo]);
      sendPhoto(file, engineId, cylinderNo).then(
        (u) => onPhotos((list) => list.map((p) => (p.key === key ? { ...p, status: "done", uploadId: u.id } : p))),
        (err: Error) => onPhotos((list) => list.map((p) => (p.key === key ? { ...p, status: "failed", message: err.message } : p))),
      );
    }
  }

  function remove(p: Photo): void {
    onPhotos((list) => list.filter((x) => x.key !== p.key));
    URL.revokeObjectURL(p.previewUrl);
    // Taken back before the set was saved: the file is archived, not attached.
    if (p.uploadId !== null) void fetch(`/api/v1/uploads/${p.uploadId}`, { method: "DELETE" }).catch(() => undefined);
  }

  return (
    <div>
      <label htmlFor={id} className="rl-button-quiet cursor-pointer !min-h-0 !py-2 text-sm has-[:focus-visible]:outline has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-focus">
        {cylinderNo === null ? "Add a photo of the set" : `Add a photo of cylinder ${cylinderNo}`}
        <input ref={input} id={id} type="file" accept="image/*" capture="environment" multiple className="sr-only" onChange={picked} data-testid={`photo-input-${cylinderNo ?? "set"}`} />
      </label>
      {mine.length ? (
        <ul className="mt-2 flex flex-wrap gap-2">
          {mine.map((p) => (
            <li key={p.key} className="w-24 text-xs">
              <img src={p.previewUrl} alt={`Photo ${p.name}`} className={`h-24 w-24 border-hair border-rule object-cover ${p.status === "uploading" ? "opacity-60" : ""}`} />
              <span className={`block ${p.status === "failed" ? "font-semibold text-oxide" : "text-pencil"}`} role="status">
                {p.status === "uploading" ? "uploading…" : p.status === "done" ? "uploaded" : `not uploaded: ${p.message}`}
              </span>
              <button type="button" className="underline" onClick={() => remove(p)}>remove</button>
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
