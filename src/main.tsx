import './lib/zod-csp.ts';
import '@fontsource/ibm-plex-sans/latin-400.css';
import '@fontsource/ibm-plex-sans/latin-600.css';
import '@fontsource/ibm-plex-mono/latin-400.css';
import './index.css';

import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from './app/app.tsx';

const root = document.getElementById('root');
if (!root) throw new Error('The page has no #root element to mount Wyeward into.');
createRoot(root).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
