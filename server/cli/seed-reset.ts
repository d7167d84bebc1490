import { createApp } from '../app';
import { loadConfig } from '../config';
import { openDb, rollbackAll } from '../lib/db';

// `npm run seed:reset`: empties the database (every migration down, then up) and loads the demo scenario.
const config = loadConfig(process.env, { demo: true, runJobs: false, serveClient: false });
const db = openDb(config);
await rollbackAll(db);
await db.destroy();
const sw = await createApp(config);
await sw.close();
console.log(`Demo scenario reloaded into ${config.dataDir}`);
