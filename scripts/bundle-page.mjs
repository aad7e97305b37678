// The report page's script: src/page/whatIfPage.ts and the rule modules it imports, bundled into one
// browser file (dist/page/whatIfPage.js) that renderReport inlines into report.html.
import { buildSync } from 'esbuild';
buildSync({
  entryPoints: ['src/page/whatIfPage.ts'], bundle: true, minify: true, format: 'iife', target: 'es2020',
  platform: 'browser', outfile: 'dist/page/whatIfPage.js', legalComments: 'none', logLevel: 'warning',
});
