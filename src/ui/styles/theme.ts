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
    --cp-invented-bg: #fff1c9;
    --cp-invented-text: #5c4300;
    --cp-invented-border: #e2bd52;
    --cp-caution-bg: #fff8ec;
    --cp-caution-border: #d99a2b;
    --cp-error-bg: #fdeeee;
    --cp-error-border: #c94a4a;
    --cp-error-text: #7d1d1d;
    --cp-ok: #22683a;
    --cp-radius: 6px;
    --cp-gap: 16px;
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
