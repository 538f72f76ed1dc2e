import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { RouterProvider } from 'react-router-dom';
import { AppProvider } from './app/provider';
import { createAppRouter } from './app/router';
import { createQueryClient } from './lib/query-client';
import './styles.css';

const queryClient = createQueryClient();
const router = createAppRouter(queryClient);

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <AppProvider client={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>
  </StrictMode>,
);
