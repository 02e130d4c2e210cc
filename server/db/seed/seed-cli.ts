// `npm run db:seed`: the same idempotent seed the server runs at start.
import { createApp } from '../../app';

const { close } = await createApp({ seed: true, config: { clientDir: null } });
await close();
console.log('seed done');
