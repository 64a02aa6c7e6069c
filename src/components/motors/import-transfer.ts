import { ApiError } from "./motors-api.ts";

// Moving a CSV file from the disk to the server with progress to show: reading it, then sending it.

/** XMLHttpRequest rather than fetch: it reports how much of a large file has gone up. */
export function postWithProgress<T>(path: string, body: unknown, onUpload: (fraction: number) => void): Promise<T> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", path);
    xhr.setRequestHeader("content-type", "application/json");
    xhr.responseType = "text";
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onUpload(e.loaded / e.total);
    };
    xhr.onerror = () => reject(new ApiError(0, "Ringland cannot be reached right now; nothing was written. Check the connection and try again."));
    xhr.onload = () => {
      let parsed: unknown = null;
      try {
        parsed = xhr.responseText ? JSON.parse(xhr.responseText) : null;
      } catch {
        parsed = null;
      }
      if (xhr.status >= 200 && xhr.status < 300) resolve(parsed as T);
      else {
        const error = (parsed as { error?: { message?: string; fields?: Record<string, string> } } | null)?.error;
        reject(new ApiError(xhr.status, error?.message ?? `The server answered ${xhr.status}.`, error?.fields ?? {}));
      }
    };
    xhr.send(JSON.stringify(body));
  });
}

export function readFile(file: File, onProgress: (fraction: number) => void): Promise<string> {
  return new Promise((resolve, reject) => {
    const reader = new FileReader();
    reader.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    reader.onerror = () => reject(new Error("The file could not be read."));
    reader.onload = () => resolve(String(reader.result ?? ""));
    reader.readAsText(file);
  });
}
