import { css } from 'lit';

/** Form controls shared by the editors: compact rows, units beside the value, problems at the field. */
export const editorStyles = css`
  .fields {
    display: grid;
    grid-template-columns: repeat(auto-fill, minmax(170px, 1fr));
    gap: 8px 12px;
  }
  .field {
    display: grid;
    gap: 2px;
    min-width: 0;
    align-content: start;
  }
  .field > label,
  .field > span {
    font-size: 12.5px;
    color: var(--cp-muted);
  }
  .field.check {
    grid-template-columns: auto 1fr;
    align-items: center;
  }
  .field.check > label {
    order: 2;
  }
  .opt {
    font-size: 11px;
    color: var(--cp-muted);
    font-style: italic;
  }
  .input-row {
    display: flex;
    align-items: center;
    gap: 4px;
    min-width: 0;
  }
  .unit {
    font-size: 12.5px;
    color: var(--cp-muted);
    min-width: 1.2em;
  }
  input[type='text'],
  input[type='search'],
  select,
  textarea {
    font: inherit;
    font-size: 13px;
    padding: 3px 6px;
    border: 1px solid var(--cp-input-border);
    border-radius: 4px;
    background: var(--cp-input-bg);
    color: var(--cp-text);
    min-width: 0;
    width: 100%;
    box-sizing: border-box;
  }
  input.quantity,
  input.number {
    font-family: var(--cp-mono);
    font-size: 12.5px;
  }
  input[aria-invalid='true'],
  select[aria-invalid='true'] {
    border-color: var(--cp-error-border);
    background: var(--cp-error-bg);
  }
  input:focus-visible,
  select:focus-visible,
  button:focus-visible,
  textarea:focus-visible {
    outline: 2px solid var(--cp-accent);
    outline-offset: 1px;
  }
  .hint {
    font-size: 11.5px;
    color: var(--cp-muted);
    margin: 0;
  }
  .field-error {
    font-size: 12px;
    color: var(--cp-error-text);
    margin: 0;
  }
  fieldset {
    margin: 0;
    padding: 6px 10px 10px;
    border: 1px solid var(--cp-border);
    border-radius: var(--cp-radius);
    min-width: 0;
    grid-column: 1 / -1;
  }
  legend {
    font-weight: 600;
    font-size: 12.5px;
    padding: 0 4px;
    display: flex;
    gap: 6px;
    align-items: center;
  }
  legend select {
    width: auto;
    font-weight: 400;
  }
  .add-object {
    grid-template-columns: 1fr auto;
    align-items: center;
  }
  button {
    font: inherit;
    font-size: 13px;
    padding: 3px 10px;
    border: 1px solid var(--cp-input-border);
    border-radius: 4px;
    background: var(--cp-button-bg);
    color: var(--cp-text);
    cursor: pointer;
  }
  button:hover:not(:disabled) {
    background: var(--cp-button-hover);
  }
  button:disabled {
    cursor: default;
    opacity: 0.5;
  }
  button.link {
    border: none;
    background: none;
    padding: 0 2px;
    color: var(--cp-accent);
    text-decoration: underline;
    font-size: 12px;
    font-weight: 400;
  }
  button.primary {
    background: var(--cp-accent);
    border-color: var(--cp-accent);
    color: var(--cp-on-accent);
  }
  button.primary:hover:not(:disabled) {
    filter: brightness(1.08);
    background: var(--cp-accent);
  }
  button.danger {
    color: var(--cp-error-text);
  }
`;
