import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';

// Fonts ship with the app (no CDN): Inter for text, Roboto Mono for numbers, tags and units.
import '@fontsource/inter/400.css';
import '@fontsource/inter/500.css';
import '@fontsource/inter/600.css';
import '@fontsource/roboto-mono/400.css';
import '@fontsource/roboto-mono/500.css';
import './index.css';

import { AppProvider } from './app/provider.tsx';
import { AppRouter } from './app/router.tsx';

const root = document.getElementById('root');
if (!root) throw new Error('The page has no #root element.');

createRoot(root).render(
  <StrictMode>
    <AppProvider>
      <AppRouter />
    </AppProvider>
  </StrictMode>,
);
