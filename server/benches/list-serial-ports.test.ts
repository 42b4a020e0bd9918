import { describe, expect, it } from 'vitest';
import { listSerialPorts } from './list-serial-ports.js';

describe('listSerialPorts', () => {
  it('passes ports through, dropping empty fields', async () => {
    const result = await listSerialPorts(async () => [
      { path: '/dev/ttyUSB0', manufacturer: 'FTDI', vendorId: '0403', productId: '6001', serialNumber: '' },
    ]);
    expect(result).toEqual({ ports: [{ path: '/dev/ttyUSB0', manufacturer: 'FTDI', vendorId: '0403', productId: '6001' }] });
  });

  it('turns a missing udevadm into an empty list with a clear message', async () => {
    const result = await listSerialPorts(async () => {
      throw new Error('spawn udevadm ENOENT');
    });
    expect(result.ports).toEqual([]);
    expect(result.message).toMatch(/udev/);
    expect(result.message).toMatch(/Type the device path/);
  });

  it('says that pseudo-terminals are not listed when nothing is found', async () => {
    const result = await listSerialPorts(async () => []);
    expect(result.message).toMatch(/Pseudo-terminals/);
  });
});
