/** Tiny helpers for the few server-rendered pages (development tools). */
export function escapeHtml(value: unknown): string {
  return String(value ?? '')
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&#39;');
}

const style = `
  body { font: 15px/1.45 system-ui, sans-serif; margin: 0; background: #f1f5f9; color: #0b1220; }
  header { background: #131c2e; color: #e2e8f0; padding: 12px 24px; }
  header b { color: #5eead4; }
  main { max-width: 860px; margin: 24px auto; padding: 0 24px; }
  section { background: #fff; border: 1px solid #cbd5e1; border-radius: 8px; padding: 16px 20px; margin-bottom: 16px; }
  h1 { font-size: 22px; margin: 0 0 4px; } h2 { font-size: 14px; text-transform: uppercase; letter-spacing: .04em; color: #475569; margin: 0 0 12px; }
  .note { color: #475569; font-size: 13px; }
  .error { color: #9f1239; font-size: 13px; margin: 4px 0 0; }
  button { font: inherit; cursor: pointer; border-radius: 6px; border: 1px solid #0b5f59; background: #0f766e; color: #fff; padding: 6px 14px; }
  button.plain { background: #fff; color: #0b1220; border-color: #94a3b8; text-align: left; width: 100%; padding: 10px 14px; }
  button.plain:hover { background: #ecfdfb; }
  label { display: block; font-size: 13px; font-weight: 600; margin: 10px 0 4px; }
  input { font: inherit; width: 100%; box-sizing: border-box; border: 1px solid #94a3b8; border-radius: 6px; padding: 6px 8px; }
  :focus-visible { outline: 2px solid #0f766e; outline-offset: 2px; }
  ul.plain { list-style: none; padding: 0; margin: 0; display: grid; gap: 8px; }
  pre { white-space: pre-wrap; word-break: break-word; background: #f8fafc; border: 1px solid #e2e8f0; padding: 10px; border-radius: 6px; font-size: 13px; }
  a { color: #0b5f59; }
`;

export function htmlPage(title: string, body: string, banner = 'Eyrie development tool'): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title><style>${style}</style></head>
<body><header><b>Eyrie</b> · ${escapeHtml(banner)}</header><main>${body}</main></body></html>`;
}
