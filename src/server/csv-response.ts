/** A CSV download: UTF-8 with a byte-order mark so spreadsheets read accents right. */
export function csvResponse(file: { filename: string; body: string }): Response {
  return new Response(`\uFEFF${file.body}`, {
    status: 200,
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${file.filename.replace(/[^A-Za-z0-9._-]/g, "_")}"`,
      "cache-control": "no-store",
    },
  });
}
