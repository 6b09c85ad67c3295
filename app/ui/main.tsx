import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from './app.js';
import { applyThemeChoice, readThemeChoice } from './common/theme.js';
import './styles.css';

// Before the first paint, so a pinned theme never flashes the other one.
applyThemeChoice(readThemeChoice());

const container = document.getElementById('root');
if (container === null) throw new Error('The page has no #root element');
createRoot(container).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
