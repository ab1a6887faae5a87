import { css } from 'lit';

/**
 * The page's colours and spacing as custom properties, set once on the app element. Custom
 * properties inherit through shadow roots, so every component reads the same values.
 */
export const themeTokens = css`
  :host {
    --cp-font: system-ui, -apple-system, 'Segoe UI', Roboto, 'Helvetica Neue', Arial, sans-serif;
    --cp-mono: ui-monospace, 'SFMono-Regular', Menlo, Consolas, monospace;
    --cp-text: #1b222a;
    --cp-muted: #56606c;
    --cp-page: #f3f5f7;
    --cp-panel: #ffffff;
    --cp-border: #d5dae0;
    --cp-rule: #e8ebef;
    --cp-accent: #1f5fa8;
    --cp-on-accent: #ffffff;
    --cp-selected-bg: #e4eefa;
    --cp-input-bg: #ffffff;
    --cp-input-border: #b9c0c8;
    --cp-button-bg: #f7f9fb;
    --cp-button-hover: #eaf0f6;
    --cp-invented-bg: #fff1c9;
    --cp-invented-text: #5c4300;
    --cp-invented-border: #e2bd52;
    --cp-caution-bg: #fff8ec;
    --cp-caution-border: #d99a2b;
    --cp-error-bg: #fdeeee;
    --cp-error-border: #c94a4a;
    --cp-error-text: #7d1d1d;
    --cp-ok: #22683a;
    --cp-ok-bg: #e8f4ec;
    --cp-radius: 6px;
    --cp-gap: 16px;
    color-scheme: light;
  }
  :host([data-theme='dark']) {
    --cp-text: #e6eaef;
    --cp-muted: #a3adb9;
    --cp-page: #14181d;
    --cp-panel: #1c2128;
    --cp-border: #343c47;
    --cp-rule: #2a313a;
    --cp-accent: #79aef2;
    --cp-on-accent: #0e1a2a;
    --cp-selected-bg: #233a55;
    --cp-input-bg: #12161b;
    --cp-input-border: #4a5461;
    --cp-button-bg: #262c34;
    --cp-button-hover: #303844;
    --cp-invented-bg: #4a3a10;
    --cp-invented-text: #f6dc94;
    --cp-invented-border: #8a6a1c;
    --cp-caution-bg: #3a2c12;
    --cp-caution-border: #a57420;
    --cp-error-bg: #3d1c1c;
    --cp-error-border: #c96a6a;
    --cp-error-text: #ffb4ab;
    --cp-ok: #7fd39a;
    --cp-ok-bg: #1c3324;
    color-scheme: dark;
  }
`;

/** Panels, headings and tables shared by the components. */
export const sharedStyles = css`
  :host {
    font-family: var(--cp-font);
    color: var(--cp-text);
    font-size: 14px;
    line-height: 1.45;
  }
  h2 {
    font-size: 15px;
    font-weight: 650;
    margin: 0 0 8px;
  }
  h3 {
    font-size: 13px;
    font-weight: 650;
    margin: 12px 0 4px;
  }
  p {
    margin: 0 0 8px;
  }
  .muted {
    color: var(--cp-muted);
  }
  .small {
    font-size: 12.5px;
  }
  table {
    border-collapse: collapse;
    width: 100%;
  }
  th,
  td {
    text-align: left;
    vertical-align: top;
    padding: 4px 8px 4px 0;
    border-bottom: 1px solid var(--cp-rule);
  }
  th {
    font-size: 12px;
    font-weight: 600;
    color: var(--cp-muted);
  }
  .num {
    font-variant-numeric: tabular-nums;
    white-space: nowrap;
  }
  ul {
    margin: 0;
    padding-left: 18px;
  }
  .visually-hidden {
    position: absolute;
    width: 1px;
    height: 1px;
    overflow: hidden;
    clip-path: inset(50%);
    white-space: nowrap;
  }
`;
