import { describe, expect, it } from 'vitest';
import { SIM_LOAD_SPEC, SIM_SUPPLY_SPEC } from './instrument-specs.js';
import { withCrc } from '../encoders/modbus/crc16.js';
import { createModbusControl, SIM_MODBUS_ERRORS } from './modbus-control.js';
import { SimInstrument } from './sim-instrument.js';
import { TestClock } from './test-clock.js';

const req = (...bytes: number[]) => withCrc(Uint8Array.from(bytes));

describe('simulated instrument as a Modbus RTU slave', () => {
  it('writes with function 16 across a 32-bit value and reads it back with 03 (Modbus V1.1b3, 6.3 and 6.12)', () => {
    const load = new SimInstrument(SIM_LOAD_SPEC, new TestClock());
    const slave = createModbusControl(load);
    // Unit 1, write 2 registers at 2 (CC set amps, u32 mA): 12500 mA = 0x0000 0x30D4.
    const [ack] = slave.receive(req(1, 0x10, 0, 2, 0, 2, 4, 0, 0, 0x30, 0xd4));
    expect([...ack.subarray(0, 6)]).toEqual([1, 0x10, 0, 2, 0, 2]);
    expect(load.values.cc).toBe(12.5);
    const [read] = slave.receive(req(1, 0x03, 0, 2, 0, 2));
    expect([...read.subarray(0, 7)]).toEqual([1, 3, 4, 0, 0, 0x30, 0xd4]);
  });

  it('answers a request split over chunks, ignores other units and bad CRCs, and gives exception 02 past the map', () => {
    const load = new SimInstrument(SIM_LOAD_SPEC, new TestClock());
    const slave = createModbusControl(load);
    const on = req(1, 0x06, 0, 12, 0, 1);
    expect(slave.receive(on.subarray(0, 3))).toEqual([]);
    expect(slave.receive(on.subarray(3))).toHaveLength(1);
    expect(load.outputOn).toBe(true);
    expect(slave.receive(req(2, 0x06, 0, 12, 0, 0))).toEqual([]);
    const broken = req(1, 0x06, 0, 12, 0, 0);
    broken[7] ^= 0xff;
    expect(slave.receive(broken)).toEqual([]);
    expect(load.outputOn).toBe(true);
    const [exception] = slave.receive(req(1, 0x03, 0, 200, 0, 1));
    expect([...exception.subarray(0, 3)]).toEqual([1, 0x83, 2]);
  });

  it('acknowledges a write the instrument refuses and leaves its error code, cleared when read', () => {
    const supply = new SimInstrument(SIM_SUPPLY_SPEC, new TestClock());
    const slave = createModbusControl(supply);
    // Mode code 1 (CP): a supply has no CP.
    expect(slave.receive(req(1, 0x06, 0, 0, 0, 1))).toHaveLength(1);
    const [first] = slave.receive(req(1, 0x03, 0, 14, 0, 1));
    expect(first[4]).toBe(SIM_MODBUS_ERRORS.modeUnavailable);
    const [second] = slave.receive(req(1, 0x03, 0, 14, 0, 1));
    expect(second[4]).toBe(0);
    expect(supply.mode).toBe('cc');
  });
});
