// `npm run db:stop`: shuts down the private MariaDB instances left running (e.g. after a crash).
import { localInstance } from './local-env';

for (const kind of ['app', 'test'] as const) await localInstance(kind).db.stop();
