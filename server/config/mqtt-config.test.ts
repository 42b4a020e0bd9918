import { describe, expect, it } from 'vitest';
import { loadConfig, parseEnv } from './config.js';

const SECRETS = { SESSION_SECRET: 'x'.repeat(40), KNEEPOINT_DB_PASSWORD: 'long-enough-password' };

describe('MQTT settings for bench gateways', () => {
  it('leaves MQTT off unless asked: nothing changes for a one-machine lab', () => {
    expect(loadConfig(SECRETS, '/tmp').mqtt).toBeNull();
  });

  it('starts a private broker with KNEEPOINT_MQTT=local on its port, or uses an outside broker URL', () => {
    expect(loadConfig({ ...SECRETS, KNEEPOINT_MQTT: 'local', KNEEPOINT_MQTT_PORT: '3561' }, '/tmp').mqtt).toEqual({ url: null, local: true, localPort: 3561 });
    expect(loadConfig({ ...SECRETS, KNEEPOINT_MQTT_URL: 'mqtts://kneepoint-server:pw@broker.northgate.example:8883' }, '/tmp').mqtt).toMatchObject({
      url: 'mqtts://kneepoint-server:pw@broker.northgate.example:8883',
      local: false,
    });
  });

  it('names a bad value', () => {
    expect(() => parseEnv({ KNEEPOINT_MQTT_URL: 'http://broker.northgate.example' })).toThrow(/KNEEPOINT_MQTT_URL: must be an mqtt:\/\/ or mqtts:\/\/ URL/);
    expect(() => parseEnv({ KNEEPOINT_MQTT: 'yes' })).toThrow(/KNEEPOINT_MQTT/);
    expect(() => parseEnv({ KNEEPOINT_MQTT_PORT: '0x1F' })).toThrow(/KNEEPOINT_MQTT_PORT/);
  });
});
