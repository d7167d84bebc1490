import path from 'node:path';
import { loadConfig } from '../config';
import { backupDataDir } from '../lib/backup';

// `npm run backup [dest]`: an online backup of DATA_DIR (default destination DATA_DIR/backups).
// To restore, stop the server and point DATA_DIR at the backup folder (or copy its contents into DATA_DIR).
const config = loadConfig();
const dest = path.resolve(process.argv[2] ?? path.join(config.dataDir, 'backups'));
try {
  const folder = await backupDataDir(config.dataDir, dest);
  console.log(`Backup written to ${folder}`);
} catch (err) {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
}
