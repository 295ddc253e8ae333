/// <reference types="vite-plugin-pwa/client" />
// Installs the service worker that keeps the app shell, read guides and articles, walks and photos
// on the phone for when the signal drops. Loaded after the page, so it costs the first view nothing.
import { registerSW } from 'virtual:pwa-register';

export function startServiceWorker() {
  if (!('serviceWorker' in navigator)) return;
  registerSW({ immediate: true });
}
