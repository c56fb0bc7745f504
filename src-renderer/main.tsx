import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from './app/App.js';
import { takeTokenFromAddress } from './bridge.js';
import './app/theme.css';

// The token must leave the fragment before the router reads the fragment as a route.
takeTokenFromAddress();

const root = document.getElementById('root');
if (!root) throw new Error('index.html has no #root element');
createRoot(root).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
