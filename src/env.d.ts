/// <reference types="astro/client" />

declare namespace App {
  interface Locals {
    user: import("lucia").User | null;
    session: import("lucia").Session | null;
    membership: import("./server/auth/guard.ts").ActiveMembership | null;
    memberships: import("./server/auth/guard.ts").ActiveMembership[];
    requestId: string;
  }
}
