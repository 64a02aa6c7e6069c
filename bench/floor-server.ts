/**
 * The floor for the roster bench: the Motors roster page served by node:http and mysql2 alone,
 * with no framework, no query builder, no schema parsing and no domain arithmetic. It runs the
 * same SQL the roster does (session and membership from the cookie, the count, the sorted page of
 * ids, the page's rows, each engine's latest reading set and its cylinder readings) on a pool of
 * the same size, so Ringland's throughput can be given as a fraction of what the database and
 * Node allow. It leaves out what the product adds: Astro's routing and middleware, Knex, zod,
 * the lookups the services repeat (organisation settings, the page's engines again) and the
 * compression figures of each engine's latest readings.
 *
 *   PORT=… DB_HOST=… DB_PORT=… DB_NAME=… DB_USER=… DB_PASSWORD=… node --import tsx bench/floor-server.ts
 *
 * Answers GET /api/v1/engines?perPage=&page=&sort= (name or a counter sort, "-" for descending)
 * and GET /health. Listens on 127.0.0.1 only.
 */
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import mysql, { type RowDataPacket } from "mysql2/promise";

const SESSION_COOKIE = "ringland_session";
const PAGE_SIZE_DEFAULT = 50;
const PAGE_SIZE_MAX = 200;
/** The roster's counter sorts, as roster-service.ts writes them. */
const COUNTER_SORTS: Record<string, string> = {
  sinceNew: "COALESCE(ct.since_new, 0)",
  sinceTopEnd: "COALESCE(ct.since_top_end, 0)",
  sinceBottomEnd: "COALESCE(ct.since_bottom_end, 0)",
  topEndShare: "COALESCE(ct.since_top_end, 0) / e.top_end_limit",
  bottomEndShare: "COALESCE(ct.since_bottom_end, 0) / e.bottom_end_limit",
};
/** Descending sorts by these counters walk engine_counters' index, as roster-service.ts does. */
const INDEXED_COUNTERS: Record<string, string> = { sinceTopEnd: "ct.since_top_end", sinceBottomEnd: "ct.since_bottom_end" };

/** The page's rows, read by id once the page is chosen (as roster-service.ts reads them). */
const ROW_SQL = `SELECT e.id, e.name, e.serial, e.status, e.cycle, e.cylinders, e.bore_mm, e.stroke_mm, e.racing_class_id,
    e.top_end_limit, e.bottom_end_limit, e.inspection_interval, e.plan_fraction, e.archived_at, e.updated_at,
    c.id AS chassis_id, c.number AS chassis_number, c.kind AS chassis_kind, c.meter_kind AS chassis_meter_kind, rc.name AS class_name,
    ct.since_new, ct.since_top_end, ct.since_bottom_end, ct.since_inspection, ct.top_on, ct.bottom_on, ct.insp_on
  FROM engines e
  LEFT JOIN engine_counters ct ON ct.engine_id = e.id
  LEFT JOIN installations i ON i.open_engine_id = e.id
  LEFT JOIN chassis c ON c.id = i.chassis_id
  LEFT JOIN racing_classes rc ON rc.id = e.racing_class_id
  WHERE e.organisation_id = ? AND e.id IN (?)`;

const pool = mysql.createPool({
  host: process.env.DB_HOST ?? "127.0.0.1",
  port: Number(process.env.DB_PORT ?? 3407),
  user: process.env.DB_USER,
  password: process.env.DB_PASSWORD,
  database: process.env.DB_NAME,
  charset: "utf8mb4",
  timezone: "Z",
  dateStrings: ["DATE"],
  decimalNumbers: true,
  connectionLimit: Number(process.env.DB_POOL_MAX ?? 10),
});

function send(res: ServerResponse, status: number, body: unknown): void {
  const text = JSON.stringify(body);
  res.writeHead(status, { "content-type": "application/json; charset=utf-8", "content-length": Buffer.byteLength(text), "cache-control": "no-store" });
  res.end(text);
}

function sessionIdOf(req: IncomingMessage): string | null {
  for (const part of (req.headers.cookie ?? "").split(";")) {
    const [name, value] = part.trim().split("=");
    if (name === SESSION_COOKIE && value && /^[a-z0-9]{10,64}$/i.test(value)) return value;
  }
  return null;
}

async function findOrganisation(sessionId: string): Promise<number | null> {
  const [rows] = await pool.query<RowDataPacket[]>(
    `SELECT s.id, s.user_id, s.expires_at, u.email, u.name, u.last_org_id, u.unit_system
       FROM sessions s JOIN users u ON u.id = s.user_id WHERE s.id = ? LIMIT 1`,
    [sessionId],
  );
  if (!rows.length || new Date(rows[0].expires_at).getTime() <= Date.now()) return null;
  const [members] = await pool.query<RowDataPacket[]>(
    `SELECT m.organisation_id, o.name, o.slug, m.role, o.time_zone, o.usage_unit, o.unit_system
       FROM memberships m JOIN organisations o ON o.id = m.organisation_id WHERE m.user_id = ? ORDER BY o.name`,
    [rows[0].user_id],
  );
  const wanted = Number(rows[0].last_org_id);
  const hit = members.find((m) => Number(m.organisation_id) === wanted) ?? members[0];
  return hit ? Number(hit.organisation_id) : null;
}

function orderBy(sort: string): string | null {
  const desc = sort.startsWith("-");
  const key = desc ? sort.slice(1) : sort;
  const dir = desc ? "DESC" : "ASC";
  if (key === "name") return `e.name ${dir}, e.id ASC`;
  const counter = COUNTER_SORTS[key];
  return counter ? `(${counter}) IS NULL, ${counter} ${dir}, e.name ASC, e.id ASC` : null;
}

async function selectPageIds(orgId: number, page: number, perPage: number, sort: string): Promise<number[]> {
  const order = orderBy(sort)!;
  const withCounters = !sort.endsWith("name");
  const indexed = sort.startsWith("-") ? INDEXED_COUNTERS[sort.slice(1)] : undefined;
  let floorClause = "";
  const params: unknown[] = [orgId];
  if (indexed) {
    const [[hit]] = await pool.query<RowDataPacket[]>(
      `SELECT ${indexed} AS v FROM engines e LEFT JOIN engine_counters ct ON ct.engine_id = e.id
        WHERE e.organisation_id = ? AND e.archived_at IS NULL AND ct.organisation_id = ? ORDER BY ${indexed} DESC LIMIT 1 OFFSET ?`,
      [orgId, orgId, page * perPage - 1],
    );
    if (hit && Number(hit.v) > 0) {
      floorClause = ` AND ct.organisation_id = ? AND ${indexed} >= ?`;
      params.push(orgId, hit.v);
    }
  }
  const [idRows] = await pool.query<RowDataPacket[]>(
    `SELECT e.id FROM engines e ${withCounters ? "LEFT JOIN engine_counters ct ON ct.engine_id = e.id" : ""}
      WHERE e.organisation_id = ? AND e.archived_at IS NULL${floorClause} ORDER BY ${order} LIMIT ? OFFSET ?`,
    [...params, perPage, (page - 1) * perPage],
  );
  return idRows.map((r) => Number(r.id));
}

async function listRoster(orgId: number, page: number, perPage: number, sort: string): Promise<unknown> {
  const [[count]] = await pool.query<RowDataPacket[]>(`SELECT COUNT(*) AS n FROM engines e WHERE e.organisation_id = ? AND e.archived_at IS NULL`, [orgId]);
  const ids = await selectPageIds(orgId, page, perPage, sort);
  const position = new Map(ids.map((id, i) => [id, i]));
  const rows = ids.length ? (await pool.query<RowDataPacket[]>(ROW_SQL, [orgId, ids]))[0] : [];
  rows.sort((a, b) => position.get(Number(a.id))! - position.get(Number(b.id))!);
  const latest = new Map<number, { id: number; takenOn: string; cylinders: unknown[] }>();
  if (ids.length) {
    const [sets] = await pool.query<RowDataPacket[]>(
      `SELECT x.* FROM (
         SELECT rs.*, ROW_NUMBER() OVER (PARTITION BY rs.engine_id ORDER BY rs.taken_on DESC, rs.id DESC) AS rn
           FROM reading_sets rs WHERE rs.organisation_id = ? AND rs.engine_id IN (?) AND rs.archived_at IS NULL
       ) x WHERE x.rn = 1`,
      [orgId, ids],
    );
    const bySet = new Map<number, { id: number; takenOn: string; cylinders: unknown[] }>();
    for (const s of sets) {
      const entry = { id: Number(s.id), takenOn: String(s.taken_on), cylinders: [] as unknown[] };
      bySet.set(entry.id, entry);
      latest.set(Number(s.engine_id), entry);
    }
    if (bySet.size) {
      const [cyl] = await pool.query<RowDataPacket[]>(`SELECT * FROM cylinder_readings WHERE reading_set_id IN (?) ORDER BY cylinder_no`, [[...bySet.keys()]]);
      for (const c of cyl) bySet.get(Number(c.reading_set_id))?.cylinders.push(c);
    }
  }
  const engines = rows.map((r) => ({
    id: Number(r.id),
    name: r.name,
    serial: r.serial,
    status: r.status,
    cylinders: Number(r.cylinders),
    chassis: r.chassis_id ? { id: Number(r.chassis_id), number: r.chassis_number } : null,
    counters: { sinceNew: r.since_new ?? 0, sinceTopEnd: r.since_top_end ?? 0, sinceBottomEnd: r.since_bottom_end ?? 0, topEndLimit: r.top_end_limit, bottomEndLimit: r.bottom_end_limit },
    latestReading: latest.get(Number(r.id)) ?? null,
  }));
  return { engines, page, perPage, total: Number(count.n) };
}

async function handle(req: IncomingMessage, res: ServerResponse): Promise<void> {
  const url = new URL(req.url ?? "/", "http://floor.invalid");
  if (req.method === "GET" && url.pathname === "/health") return send(res, 200, { ok: true });
  if (req.method !== "GET" || url.pathname !== "/api/v1/engines") return send(res, 404, { error: { code: "not_found" } });
  const sessionId = sessionIdOf(req);
  const orgId = sessionId ? await findOrganisation(sessionId) : null;
  if (orgId === null) return send(res, 401, { error: { code: "unauthorized" } });
  const page = Number(url.searchParams.get("page") ?? 1);
  const perPage = Number(url.searchParams.get("perPage") ?? PAGE_SIZE_DEFAULT);
  const sort = url.searchParams.get("sort") ?? "name";
  if (!Number.isInteger(page) || page < 1 || !Number.isInteger(perPage) || perPage < 1 || perPage > PAGE_SIZE_MAX || orderBy(sort) === null) {
    return send(res, 400, { error: { code: "invalid_input" } });
  }
  send(res, 200, await listRoster(orgId, page, perPage, sort));
}

const server = createServer((req, res) => {
  handle(req, res).catch((err: unknown) => {
    console.error("floor: request failed", err);
    if (!res.headersSent) send(res, 500, { error: { code: "internal" } });
  });
});

const port = Number(process.env.PORT ?? 0);
server.listen(port, "127.0.0.1", () => {
  console.log(`floor: listening on 127.0.0.1:${port}`);
});

function stop(): void {
  server.close();
  void pool.end().finally(() => process.exit(0));
}
process.on("SIGTERM", stop);
process.on("SIGINT", stop);
