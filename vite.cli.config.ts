import { defineConfig } from 'vite';

// The command line (src/cli) built into plain JavaScript for Node 20; npm's "prepare" script runs this,
// so npm install and npm ci in a clone build it. Packages in node_modules stay imports (they are dependencies).
export default defineConfig({
  publicDir: false,
  logLevel: 'warn',
  build: {
    ssr: 'src/cli/main.ts',
    outDir: 'dist-cli',
    emptyOutDir: true,
    target: 'node20',
    sourcemap: false,
  },
});
