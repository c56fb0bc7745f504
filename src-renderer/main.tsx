import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from './app/App.js';
import { takeTokenFromAddress } from './bridge.js';
import './app/theme.css';
import { CSS_COLOURS } from '../shared-core/present/palette.js';

// The token must leave the fragment before the router reads the fragment as a route.
takeTokenFromAddress();

// One palette with the memo: the style sheets read these custom properties.
for (const [name, value] of Object.entries(CSS_COLOURS)) document.documentElement.style.setProperty(name, value);

const root = document.getElementById('root');
if (!root) throw new Error('index.html has no #root element');
createRoot(root).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
