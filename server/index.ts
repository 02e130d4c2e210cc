import { createApp } from './app';
import { warmLargeStations } from './modules/compute/compute.service';

const { app, ctx, close } = await createApp();
const server = app.listen(ctx.config.port, () => {
  ctx.logger.info(`Tetherwise is serving on http://localhost:${ctx.config.port}`);
  // the first plan's day on a large station should not wait for its clip graph
  warmLargeStations(ctx).catch((err: unknown) =>
    ctx.logger.warn({ err }, 'clip graphs of the large stations were not warmed at start'),
  );
});

let stopping = false;
function shutdown(signal: string) {
  if (stopping) return;
  stopping = true;
  ctx.logger.info({ signal }, 'shutting down');
  // live streams never end by themselves: end them so the server can close
  ctx.events.close();
  server.close(() => {
    close().finally(() => process.exit(0));
  });
  setTimeout(() => process.exit(0), 5000).unref();
}
process.on('SIGINT', () => shutdown('SIGINT'));
process.on('SIGTERM', () => shutdown('SIGTERM'));
