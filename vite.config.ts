import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vite';
import { VitePWA } from 'vite-plugin-pwa';
import { fileURLToPath } from 'node:url';

type Match = { url: URL; sameOrigin: boolean };

export default defineConfig({
  plugins: [
    react(),
    tailwindcss(),
    VitePWA({
      // Registered from src/lib/service-worker.ts after the page has loaded, off the critical path.
      injectRegister: false,
      registerType: 'autoUpdate',
      includeAssets: ['favicon.svg'],
      manifest: {
        name: 'Beadpath',
        short_name: 'Beadpath',
        description: 'Troubleshooting guides, calculators and service records for dispensing valves',
        start_url: '/',
        scope: '/',
        display: 'standalone',
        theme_color: '#FBF8F1',
        background_color: '#FBF8F1',
        icons: [
          { src: '/icon-192.png', sizes: '192x192', type: 'image/png', purpose: 'any' },
          { src: '/icon-512.png', sizes: '512x512', type: 'image/png', purpose: 'any' },
          // The mark sits inside the safe zone, so the same drawing serves cropped launchers.
          { src: '/icon-512.png', sizes: '512x512', type: 'image/png', purpose: 'maskable' },
          { src: '/icon.svg', sizes: 'any', type: 'image/svg+xml', purpose: 'any' },
        ],
      },
      workbox: {
        // The shell and every page chunk, so a page first opened without signal still loads —
        // except the authoring editors, which need a connection to save anyway. Only Latin font
        // files: the other scripts' faces load on demand and are cached below when used.
        globPatterns: ['**/*.{js,css,html,svg,png,webmanifest}', 'assets/lora-latin-*.woff2'],
        globIgnores: ['**/rich-text-editor-*.js', '**/guide-editor-page-*.js', '**/article-editor-page-*.js'],
        navigateFallback: '/index.html',
        navigateFallbackDenylist: [/^\/api\//],
        clientsClaim: true,
        skipWaiting: true,
        cleanupOutdatedCaches: true,
        // Routes match GET only (workbox's default), so POST/PUT/PATCH/DELETE always go to the
        // network and are never cached. The matchers are copied into sw.js as source text, so each
        // is self-contained.
        runtimeCaching: [
          {
            // Content a technician reads in the field: fresh when there is signal, the last copy
            // when there is none. A short wait before falling back: one bar of signal can hang.
            urlPattern: ({ url, sameOrigin }: Match) => sameOrigin && /^\/api\/(guides|articles)(\/|$)/.test(url.pathname),
            handler: 'NetworkFirst',
            options: { cacheName: 'beadpath-api', networkTimeoutSeconds: 5, cacheableResponse: { statuses: [200] }, expiration: { maxEntries: 300, maxAgeSeconds: 30 * 24 * 3600 } },
          },
          {
            // Walks and the session: never a timeout, so a slow answer is not replaced by an
            // older copy; the cached session only lets the shell open offline (the server still
            // checks every request).
            urlPattern: ({ url, sameOrigin }: Match) => sameOrigin && /^\/api\/(walks(\/|$)|auth\/me$)/.test(url.pathname),
            handler: 'NetworkFirst',
            options: { cacheName: 'beadpath-api', cacheableResponse: { statuses: [200] }, expiration: { maxEntries: 300, maxAgeSeconds: 30 * 24 * 3600 } },
          },
          {
            // Photos and drawings never change under an id; a signed-in same-origin request carries
            // the session cookie, and only successful answers are kept.
            urlPattern: ({ url, sameOrigin }: Match) => sameOrigin && /^\/api\/files\//.test(url.pathname),
            handler: 'CacheFirst',
            options: { cacheName: 'beadpath-files', cacheableResponse: { statuses: [200] }, expiration: { maxEntries: 400, maxAgeSeconds: 60 * 24 * 3600 } },
          },
          {
            // Hashed, immutable build files left out of the precache (editors, other font faces).
            urlPattern: ({ url, sameOrigin }: Match) => sameOrigin && /^\/assets\//.test(url.pathname),
            handler: 'CacheFirst',
            options: { cacheName: 'beadpath-assets', cacheableResponse: { statuses: [200] }, expiration: { maxEntries: 80 } },
          },
        ],
      },
    }),
  ],
  resolve: { alias: { '@': fileURLToPath(new URL('./src', import.meta.url)) } },
  build: { outDir: 'dist', emptyOutDir: true, sourcemap: false, chunkSizeWarningLimit: 900, manifest: true, modulePreload: { polyfill: false } },
  server: { watch: { ignored: ['**/.data/**', '**/shots/**', '**/test-results/**'] } },
});
