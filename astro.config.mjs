// @ts-check
import { defineConfig } from 'astro/config';
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwindcss from '@tailwindcss/vite';
import { fileURLToPath } from 'node:url';
import { precompress } from './scripts/precompress.mjs';

const port = Number(process.env.PORT ?? 4321);

export default defineConfig({
  output: 'server',
  adapter: node({ mode: 'standalone' }),
  integrations: [react(), precompressClient()],
  server: { host: process.env.HOST ?? 'localhost', port },
  // The Node adapter ignores the Host header unless it is listed here; without it every form POST
  // fails the origin check. A hostname-only entry accepts any port.
  security: {
    checkOrigin: true,
    allowedDomains: [{ hostname: 'localhost' }, { hostname: '127.0.0.1' }, ...extraDomains()],
  },
  vite: {
    plugins: [tailwindcss()],
    // Web workers are bundled by Vite outside Astro's own resolver: give them the `@/` alias too.
    resolve: { alias: { '@': fileURLToPath(new URL('./src', import.meta.url)) } },
    worker: { format: 'es' },
    ssr: { external: ['better-sqlite3', '@node-rs/argon2'] },
  },
});

/** Further host names from QUADRILLE_ALLOWED_HOSTS (comma separated), for deployments behind a name. */
function extraDomains() {
  return (process.env.QUADRILLE_ALLOWED_HOSTS ?? '')
    .split(',')
    .map((h) => h.trim())
    .filter(Boolean)
    .map((hostname) => ({ hostname }));
}

/**
 * After a build, brotli and gzip copies of the client's text assets (scripts/precompress.mjs),
 * which scripts/serve.mjs sends to browsers that accept them.
 * @returns {import('astro').AstroIntegration}
 */
function precompressClient() {
  /** @type {URL | undefined} */
  let clientDir;
  return {
    name: 'quadrille-precompress',
    hooks: {
      'astro:config:done': ({ config }) => {
        clientDir = config.build.client;
      },
      'astro:build:done': ({ logger }) => {
        if (!clientDir) return;
        const { files, raw, brotli } = precompress(fileURLToPath(clientDir));
        logger.info(`${files} assets precompressed: ${(raw / 1024).toFixed(0)} kB, ${(brotli / 1024).toFixed(0)} kB as brotli`);
      },
    },
  };
}
