// npm start: install what is missing, build, migrate + seed the demo database, start the one server
// (API + socket.io + UI + simulated fixtures) and print the URL and demo sign-ins.
import { resolve } from 'node:path';
import { buildAll, ensureNodeModules, log, root, run, spawn } from './lib.mjs';

const port = Number(process.env.PORT ?? 3000);
const dbPath = resolve(root, process.env.DATABASE_PATH ?? 'data/railwright.sqlite');
const env = {
  ...process.env,
  PORT: String(port),
  DATABASE_PATH: dbPath,
  UI_DIST: resolve(root, 'station-ui/dist'),
  // demo mode: without JWT_SECRET the server keeps a random secret in the data folder (never in the repo)
  RAILWRIGHT_DEMO: '1',
  // this computer only, unless asked otherwise; the server prints how to open it to the plant network
  HOST: process.env.HOST ?? '127.0.0.1',
  // keep the console readable for the URL and sign-ins; LOG_LEVEL=log shows every route at start
  LOG_LEVEL: process.env.LOG_LEVEL ?? 'warn',
};

ensureNodeModules();
buildAll();
log(`Applying migrations and seeding the demo plant into ${dbPath} (first start takes up to a minute)...`);
run('node', ['station-api/dist/database/seed-cli.js'], { env });

log('Starting the station server...');
const server = spawn('node', ['station-api/dist/main.js'], { cwd: root, env, stdio: 'inherit' });

const url = `http://${env.HOST === '0.0.0.0' || env.HOST === '::' ? 'localhost' : env.HOST}:${port}`;
const started = Date.now();
const poll = setInterval(async () => {
  try {
    const res = await fetch(`${url}/api/docs/openapi.json`);
    if (!res.ok) return;
    clearInterval(poll);
    console.log(`
  Railwright is running:  ${url}
  API documentation:      ${url}/api/docs
  Database:               ${dbPath}

  Demo sign-ins (user / password):
    operator / operator-demo    (test units at a station)
    engineer / engineer-demo    (plans, fixtures, lots)
    quality  / quality-demo     (yield, lots)
    admin    / admin-demo       (users, audit log)

  Simulated fixtures FX-101..FX-103 are attached to stations EOL-1..EOL-3.
  ${env.HOST.startsWith('127.') || env.HOST === 'localhost'
    ? 'Only this computer can open it. For the plant network: HOST=0.0.0.0 JWT_SECRET=<32+ random bytes> npm start'
    : `Listening on ${env.HOST}: other computers on the network can open it.`}
  Ctrl-C stops the server.
`);
  } catch {
    if (Date.now() - started > 60_000) {
      clearInterval(poll);
      log('The server did not answer within 60 s; see the messages above.');
    }
  }
}, 500);

let stopping = false;
for (const sig of ['SIGINT', 'SIGTERM']) {
  process.on(sig, () => {
    if (stopping) return;
    stopping = true;
    log('Stopping (the fixtures are put in a safe state first)...');
    server.kill('SIGTERM');
  });
}
server.on('exit', (code, signal) => {
  clearInterval(poll);
  process.exit(stopping ? 0 : (code ?? (signal ? 1 : 0)));
});
