// Builds the tablet app with the project's own Vite config into a folder, stamping index.html with a
// build label: two labels give two genuinely different releases (a changed page, so a changed
// precache list and service worker), as a real deploy would.
// Usage: node --import tsx tests/e2e/tablet-build-variant.ts <outDir> <label>
import { build } from 'vite';
import type { Plugin } from 'vite';

/** The meta tag a browser test reads to tell which release a page came from. */
export const buildLabelMetaName = 'rhythm-ledger-build';

function buildLabel(label: string): Plugin {
  return {
    name: 'rhythm-ledger-build-label',
    transformIndexHtml: () => [{ tag: 'meta', attrs: { name: buildLabelMetaName, content: label }, injectTo: 'head' }],
  };
}

const [outDir, label] = process.argv.slice(2);
if (import.meta.url === `file://${process.argv[1]}`) {
  if (!outDir || !label) {
    console.error('usage: tablet-build-variant.ts <outDir> <label>');
    process.exit(2);
  }
  await build({ configFile: 'vite.config.ts', mode: 'production', logLevel: 'warn', plugins: [buildLabel(label)], build: { outDir, emptyOutDir: true } });
}
