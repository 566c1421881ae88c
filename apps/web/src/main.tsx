import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
// Lato is bundled (woff2 files land in dist/assets): no request leaves our origin for fonts.
import '@fontsource/lato/300.css';
import '@fontsource/lato/400.css';
import '@fontsource/lato/400-italic.css';
import '@fontsource/lato/700.css';
import '@fontsource/dejavu-sans/400.css';
import '@fontsource/dejavu-sans/700.css';
import '@blueprintjs/core/lib/css/blueprint.css';
import './styles.css';
import { App, createQueryClient } from './App';

const root = document.getElementById('root');
if (!root) throw new Error('index.html has no #root element');

createRoot(root).render(
  <StrictMode>
    <App client={createQueryClient()} />
  </StrictMode>,
);
