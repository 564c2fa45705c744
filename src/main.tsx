import '@fontsource/roboto-flex';
import './index.css';
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { RouterProvider } from 'react-router-dom';
import { Providers } from './app/providers';
import { createQueryClient } from './app/query-client';
import { createRouter } from './app/router';
import { reportCaughtError } from './lib/errors';

const queryClient = createQueryClient();
const router = createRouter(queryClient);

const container = document.getElementById('root');
if (!container) throw new Error('index.html has no #root element');

createRoot(container, { onCaughtError: reportCaughtError }).render(
  <StrictMode>
    <Providers queryClient={queryClient}>
      <RouterProvider router={router} />
    </Providers>
  </StrictMode>,
);
