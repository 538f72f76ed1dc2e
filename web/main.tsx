import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { RouterProvider } from 'react-router-dom';
import { AppProvider } from './app/provider';
import { createAppRouter } from './app/router';
import { createQueryClient } from './lib/query-client';
import './styles.css';

// The typefaces start loading now, beside the page's code and first requests, rather than when a
// page first lays out text in them: a face that arrives after the page is drawn has the browser lay
// the whole page out again (on the campaign page, once per face). Greek covers the Δ of ΔΔH‡.
for (const [font, text] of [
  ['400 1em Inter', 'AΔ'],
  ['500 1em Inter', 'AΔ'],
  ['600 1em Inter', 'A'],
  ['400 1em "JetBrains Mono"', 'A'],
] as const)
  void document.fonts?.load(font, text).catch(() => undefined);

const queryClient = createQueryClient();
const router = createAppRouter(queryClient);

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <AppProvider client={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>
  </StrictMode>,
);
