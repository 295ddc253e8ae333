import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { QueryClientProvider } from '@tanstack/react-query';
import { RouterProvider } from 'react-router';
import '@fontsource/lora/400.css';
import '@fontsource/lora/600.css';
import '@fontsource/lora/700.css';
import './styles.css';
import { createQueryClient } from '@/lib/query-client';
import { router } from '@/app/router';
import { whenIdle } from '@/lib/use-after-first-view';

const queryClient = createQueryClient();

// After the page is up and the browser idle, so installing the offline copy never competes with
// the first view.
window.addEventListener('load', () => {
  whenIdle(() => void import('@/lib/service-worker').then((m) => m.startServiceWorker()));
});

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>
  </StrictMode>,
);
