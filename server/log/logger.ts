/**
 * The server's one logger shape. Every line names the part of the server it comes from
 * (`createLogger('archive')` writes "[archive] …"), and an error given beside a message is
 * passed on as the object itself, so its stack reaches the log.
 */
export interface Logger {
  info(message: string, error?: unknown): void;
  warn(message: string, error?: unknown): void;
  error(message: string, error?: unknown): void;
}

/** Writes to the process's console; an Error goes to console as the object (stack kept). */
export const consoleLogger: Logger = {
  info: (message, error) => (error === undefined ? console.log(message) : console.log(message, error)),
  warn: (message, error) => (error === undefined ? console.warn(message) : console.warn(message, error)),
  error: (message, error) => (error === undefined ? console.error(message) : console.error(message, error)),
};

/** Says nothing (tests that do not look at the log). */
export const quietLogger: Logger = { info: () => undefined, warn: () => undefined, error: () => undefined };

/**
 * A logger for one part of the server, writing through `sink` (the console by default, the
 * app context's logger where there is one). Namespaces nest: `createLogger('ws', createLogger('live'))`
 * writes "[live] [ws] …". The sink is looked up at each line, so a sink swapped later is used.
 */
export function createLogger(namespace: string, sink: Logger = consoleLogger): Logger {
  const prefix = `[${namespace}] `;
  return {
    info: (message, error) => sink.info(prefix + message, error),
    warn: (message, error) => sink.warn(prefix + message, error),
    error: (message, error) => sink.error(prefix + message, error),
  };
}
