import pino from 'pino';

export type Logger = pino.Logger;

export function createLogger(level: string): Logger {
  return pino({
    level,
    redact: {
      paths: ['req.headers.cookie', 'res.headers["set-cookie"]', 'password', '*.password'],
      remove: true,
    },
  });
}
