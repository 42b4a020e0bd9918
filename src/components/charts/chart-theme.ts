/** Chart colours that follow the theme, read from the CSS variables in styles.css. */
export function chartTheme(): { axis: string; grid: string } {
  const css = getComputedStyle(document.documentElement);
  return {
    axis: css.getPropertyValue('--kp-chart-axis').trim() || '#888',
    grid: css.getPropertyValue('--kp-chart-grid').trim() || 'rgba(128,128,128,0.15)',
  };
}

/** Axis font: numbers in JetBrains Mono like everywhere else. */
export const AXIS_FONT = '12px "JetBrains Mono", ui-monospace, monospace';
