// npm run dev: API rebuilt and restarted on change, plus Vite's dev server proxying /api to it.
import { resolve } from 'node:path';
import { ensureNodeModules, log, root, run, spawn } from './lib.mjs';

ensureNodeModules();
run('npm', ['run', 'build', '-w', 'mock-fixture']);
run('npm', ['run', 'build', '-w', 'station-api']);
const env = {
  ...process.env,
  DATABASE_PATH: resolve(root, process.env.DATABASE_PATH ?? 'data/railwright.sqlite'),
  // demo secret in the data folder; Vite's dev server (another origin) may open sockets
  RAILWRIGHT_DEMO: '1',
  CORS_ORIGINS: process.env.CORS_ORIGINS ?? 'http://localhost:5173',
};
run('node', ['station-api/dist/database/seed-cli.js'], { env });

const children = [
  spawn('npm', ['run', 'dev', '-w', 'station-api'], { cwd: root, stdio: 'inherit', env }),
  spawn('node', ['--watch-path=station-api/dist', 'station-api/dist/main.js'], { cwd: root, stdio: 'inherit', env }),
  spawn('npm', ['run', 'dev', '-w', 'station-ui'], { cwd: root, stdio: 'inherit', env }),
];
log('API on http://localhost:3000, UI dev server on http://localhost:5173 (Ctrl-C stops both)');
const stop = () => children.forEach((c) => c.kill('SIGTERM'));
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
