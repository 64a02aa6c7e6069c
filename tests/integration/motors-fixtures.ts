import { ListObjectsV2Command } from "@aws-sdk/client-s3";
import { ApiClient, BASE_URL, signedIn, type ApiResponse } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { addMember, createOrganisation, createUser, uniqueSuffix } from "../factories/people.ts";
import { createChassis, createEngine, type EngineAttrs } from "../factories/motors.ts";
import { createStorage, type ObjectStorage } from "../../src/server/storage/s3.ts";
import type { Role } from "../../src/lib/permissions.ts";

// Shared set-up of the motors integration tests: a fresh organisation per test file with one
// signed-in person per role, and a second organisation whose data must never show.

const PASSWORD = "a-long-motors-password";

export interface Crew {
  orgId: number;
  owner: ApiClient;
  manager: ApiClient;
  chief: ApiClient;
  mechanic: ApiClient;
  viewer: ApiClient;
  userIds: Record<Role, string>;
}

export async function createCrew(opts: { usageUnit?: "hours" | "kilometres"; shopElevationM?: number | null } = {}): Promise<Crew> {
  await clearSignInAttempts();
  const s = uniqueSuffix();
  const orgId = await createOrganisation(testDb(), {
    name: `Motors Test ${s}`,
    slug: `motors-${s}`,
    usageUnit: opts.usageUnit ?? "hours",
    shopElevationM: opts.shopElevationM === undefined ? 366 : opts.shopElevationM,
    timeZone: "UTC",
  });
  const clients: Partial<Record<Role, ApiClient>> = {};
  const userIds: Partial<Record<Role, string>> = {};
  for (const role of ["owner", "manager", "crew_chief", "mechanic", "viewer"] as const) {
    const email = `${role}-${s}@motors.example`;
    const id = await createUser(testDb(), { email, name: `Test ${role}`, password: PASSWORD });
    await addMember(testDb(), orgId, id, role);
    userIds[role] = id;
    clients[role] = await signedIn(email, PASSWORD);
  }
  return {
    orgId,
    owner: clients.owner!,
    manager: clients.manager!,
    chief: clients.crew_chief!,
    mechanic: clients.mechanic!,
    viewer: clients.viewer!,
    userIds: userIds as Record<Role, string>,
  };
}

let engineCounter = 0;
export async function engineIn(orgId: number, attrs: Partial<EngineAttrs> = {}): Promise<number> {
  engineCounter += 1;
  return createEngine(testDb(), orgId, { name: `T-${engineCounter}-${uniqueSuffix()}`.slice(0, 60), status: "spare", ...attrs });
}

export async function chassisIn(orgId: number, meterKind: "hours" | "km" | "none" = "hours"): Promise<number> {
  return createChassis(testDb(), orgId, { number: `C${uniqueSuffix()}`.slice(0, 20), meterKind });
}

/** multipart/form-data POST with the client's session, as a browser form would send it. */
export async function upload(
  client: ApiClient,
  fields: Record<string, string>,
  file: { name: string; bytes: Uint8Array; type?: string } | null,
): Promise<ApiResponse> {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.append(k, v);
  if (file) form.append("file", new Blob([new Uint8Array(file.bytes)], { type: file.type ?? "application/octet-stream" }), file.name);
  const res = await fetch(`${BASE_URL}/api/v1/uploads`, {
    method: "POST",
    body: form,
    headers: { origin: new URL(BASE_URL).origin, ...(client.cookies.size ? { cookie: client.cookieHeader() } : {}) },
  });
  const text = await res.text();
  return { status: res.status, body: (res.headers.get("content-type") ?? "").includes("json") ? JSON.parse(text) : text, headers: res.headers };
}

let storage: ObjectStorage | null = null;
export function testStorage(): ObjectStorage {
  storage ??= createStorage({
    endpoint: process.env.S3_ENDPOINT ?? "http://127.0.0.1:4569",
    region: process.env.S3_REGION ?? "us-east-1",
    bucket: process.env.S3_BUCKET ?? "ringland-uploads",
    accessKeyId: process.env.S3_ACCESS_KEY_ID ?? "S3RVER",
    secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? "S3RVER",
    forcePathStyle: true,
  });
  return storage;
}

/** Every object key under an organisation's prefix in the uploads bucket. */
export async function listObjectKeys(orgId: number): Promise<string[]> {
  const s = testStorage();
  const keys: string[] = [];
  let token: string | undefined;
  do {
    const page = await s.client.send(new ListObjectsV2Command({ Bucket: s.bucket, Prefix: `org-${orgId}/`, ContinuationToken: token }));
    for (const o of page.Contents ?? []) if (o.Key) keys.push(o.Key);
    token = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (token);
  return keys;
}

export const TODAY = new Date().toISOString().slice(0, 10);

export function daysAgo(n: number): string {
  return new Date(Date.now() - n * 86_400_000).toISOString().slice(0, 10);
}
