// The response panel's HTML: a strict Content-Security-Policy (nothing by default; scripts only
// with the per-load nonce; styles and fonts only from the extension's own files), no inline code.

export interface PanelPage {
  /** The webview's source expression for the extension's own files (webview.cspSource). */
  cspSource: string;
  scriptUri: string;
  styleUri: string;
  /** Fresh random value per page load. */
  nonce: string;
  title: string;
}

export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

export function panelHtml(page: PanelPage): string {
  const csp = [
    "default-src 'none'",
    `img-src ${page.cspSource} data:`,
    `style-src ${page.cspSource} 'nonce-${page.nonce}'`,
    `font-src ${page.cspSource}`,
    `script-src 'nonce-${page.nonce}'`,
  ].join('; ');
  const title = escapeHtml(page.title);
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="UTF-8">
<meta http-equiv="Content-Security-Policy" content="${csp}">
<meta name="viewport" content="width=device-width, initial-scale=1.0">
<link rel="stylesheet" nonce="${page.nonce}" href="${escapeHtml(page.styleUri)}">
<title>${title}</title>
</head>
<body>
<p id="status" role="status" hidden></p>
<main id="plots" aria-label="${title}"></main>
<script nonce="${page.nonce}" src="${escapeHtml(page.scriptUri)}"></script>
</body>
</html>`;
}
