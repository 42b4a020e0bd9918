import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import '@fontsource/jetbrains-mono/latin-400.css';
import '@fontsource/jetbrains-mono/latin-700.css';
import './styles.css';
import { App } from './app/app';
import { installAudioUnlock } from './lib/alarm-sound';
import { paletteCss } from './lib/palette';
import { applyTheme, loadTheme } from './lib/theme';
import { followSystemTheme } from './lib/use-theme';

// The palette's themed colours as CSS variables, before the first paint.
const paletteStyle = document.createElement('style');
paletteStyle.dataset.kneepoint = 'palette';
paletteStyle.textContent = paletteCss();
document.head.append(paletteStyle);

applyTheme(loadTheme());
followSystemTheme();
installAudioUnlock();

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
