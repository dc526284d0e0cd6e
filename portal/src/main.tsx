import '@fontsource-variable/atkinson-hyperlegible-next';
import './index.css';
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { RouterProvider } from 'react-router-dom';
import { AppProvider } from './app/provider';
import { createAppRouter } from './app/router';

const container = document.getElementById('root');
if (!container) throw new Error('index.html must contain an element with id "root"');

const router = createAppRouter();

createRoot(container).render(
  <StrictMode>
    <AppProvider>
      <RouterProvider router={router} />
    </AppProvider>
  </StrictMode>,
);
