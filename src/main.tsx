import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import '@fontsource/jetbrains-mono/latin-400.css';
import '@fontsource/jetbrains-mono/latin-700.css';
import './styles.css';
import { App } from './app/app';
import { installAudioUnlock } from './lib/alarm-sound';
import { applyTheme, loadTheme } from './lib/theme';

applyTheme(loadTheme());
installAudioUnlock();

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
