import '@fontsource/atkinson-hyperlegible/400.css';
import '@fontsource/atkinson-hyperlegible/700.css';
import './index.css';
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { z } from 'zod';
import { registerLiveBindings } from './app/live-bindings';
import { AppProvider } from './app/provider';
import { AppRouter } from './app/router';

// Our content security policy forbids eval: tell zod not to try compiling parsers with new Function().
z.config({ jitless: true });

registerLiveBindings();

const container = document.getElementById('root');
if (!container) throw new Error('index.html has no #root element');

createRoot(container).render(
  <StrictMode>
    <AppProvider>
      <AppRouter />
    </AppProvider>
  </StrictMode>,
);
