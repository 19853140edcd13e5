/// <reference types="astro/client" />

declare namespace App {
  interface Locals {
    /** The signed-in user, or null. Always set by the middleware. */
    user: import('./lib/server/auth/session').SessionUser | null;
    /** The current session, or null. Always set by the middleware. */
    session: import('lucia').Session | null;
  }
}
