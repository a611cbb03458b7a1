import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import '@fontsource-variable/inter';
import '@fontsource/jetbrains-mono/400.css';
import '@fontsource/jetbrains-mono/700.css';
import '@/styles/index.css';
import { AppProvider } from '@/app/provider';
import { AppRouter } from '@/app/router';
import { applyStoredAmberRoom } from '@/lib/amber-room';

// Before the first paint, so a screen in the litho bay never flashes the colour scheme.
applyStoredAmberRoom();

const container = document.getElementById('root');
if (!container) throw new Error('index.html has no #root element');

createRoot(container).render(
  <StrictMode>
    <AppProvider>
      <AppRouter />
    </AppProvider>
  </StrictMode>,
);
