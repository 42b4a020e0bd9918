import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { parseArgs } from 'node:util';
import { z } from 'zod';
import { GatewayNameSchema } from '../../shared/schemas/gateway.js';
import { GatewayRuntime, SHUTDOWN_DRAIN_MS } from './gateway-runtime.js';

/**
 * `npm run gateway -- --broker mqtt://host:1883 --id <name> [--password-file F] [--dir D]`, or
 * the same through KNEEPOINT_GATEWAY_BROKER, _ID, _PASSWORD (or _PASSWORD_FILE) and _DIR.
 * The password is the one shown once when an admin registered the gateway.
 */
const OptionsSchema = z.object({
  broker: z.url({ protocol: /^mqtts?$/, error: 'must be an mqtt:// or mqtts:// URL' }),
  id: GatewayNameSchema,
  password: z.string().min(1, 'give --password-file or KNEEPOINT_GATEWAY_PASSWORD'),
  dir: z.string().min(1),
});

function readOptions(): z.infer<typeof OptionsSchema> {
  const { values } = parseArgs({ options: { broker: { type: 'string' }, id: { type: 'string' }, 'password-file': { type: 'string' }, dir: { type: 'string' } } });
  const env = process.env;
  const passwordFile = values['password-file'] ?? env.KNEEPOINT_GATEWAY_PASSWORD_FILE;
  const id = values.id ?? env.KNEEPOINT_GATEWAY_ID ?? '';
  const parsed = OptionsSchema.safeParse({
    broker: values.broker ?? env.KNEEPOINT_GATEWAY_BROKER,
    id,
    password: passwordFile ? readFileSync(passwordFile, 'utf8').trim() : (env.KNEEPOINT_GATEWAY_PASSWORD ?? ''),
    dir: resolve(values.dir ?? env.KNEEPOINT_GATEWAY_DIR ?? `.data/gateway-${id}`),
  });
  if (parsed.success) return parsed.data;
  const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
  console.error(`Invalid gateway options:\n${lines.join('\n')}`);
  process.exit(2);
}

const options = readOptions();
const gateway = new GatewayRuntime({ brokerUrl: options.broker, name: options.id, password: options.password, dir: options.dir });
await gateway.start();
console.log(`Gateway ${options.id} running; outbox in ${options.dir}`);
let stopping = false;
const stop = async (signal: string) => {
  if (stopping) return;
  stopping = true;
  console.log(`${signal}: stopping gateway (outbox depth ${gateway.outboxDepth})`);
  await gateway.stop(SHUTDOWN_DRAIN_MS);
  process.exit(0);
};
process.on('SIGINT', () => void stop('SIGINT'));
process.on('SIGTERM', () => void stop('SIGTERM'));
