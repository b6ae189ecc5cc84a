import { SerialPortStream } from '@serialport/stream';
import { afterEach, describe, expect, it } from 'vitest';
import { SimulatedFixtureBinding, attachSimulator, detachSimulator, simulatorAt } from './binding';
import { FixtureSimulator } from './protocol/fixture-simulator';
import { LineClient } from './test-support/line-client';

const opened: SerialPortStream[] = [];

function open(path: string): Promise<{ port: SerialPortStream; client: LineClient }> {
  return new Promise((resolve, reject) => {
    const port = new SerialPortStream({ binding: SimulatedFixtureBinding, path, baudRate: 115200 }, (error) => {
      if (error) reject(error);
      else resolve({ port, client: new LineClient(port) });
    });
    opened.push(port);
  });
}

function close(port: SerialPortStream): Promise<void> {
  return new Promise((resolve) => (port.isOpen ? port.close(() => resolve()) : resolve()));
}

afterEach(async () => {
  await Promise.all(opened.splice(0).map(close));
});

describe('SimulatedFixtureBinding', () => {
  it('round-trips *IDN? through SerialPortStream and ReadlineParser', async () => {
    attachSimulator('mock:FX-101', new FixtureSimulator({ fixtureId: 'FX-101', timing: 'instant' }));
    const { client } = await open('mock:FX-101');
    expect(await client.query('*IDN?')).toMatch(/^RAILWRIGHT,SIM-FIXTURE,FX-101,/);
    detachSimulator('mock:FX-101');
  });

  it('runs a whole good-unit sequence and keeps replies in order', async () => {
    const sim = new FixtureSimulator({ fixtureId: 'FX-102', timing: 'instant', config: { defectRates: {} } });
    attachSimulator('mock:FX-102', sim);
    const { client } = await open('mock:FX-102');
    // sets produce no reply, so several can go out before the next query
    for (const line of ['*RST', '*CLS', 'UUT:SER "K3E-2648-00007","OB-BK3305","LB-2648-03"', 'SOUR:VOLT 24', 'OUTP ON', 'LOAD OFF']) {
      await client.write(line);
    }
    expect(await client.query('*OPC?')).toBe('1');
    const iinNoLoadMa = Number(await client.query('MEAS:CURR:IN?')) * 1000;
    expect(iinNoLoadMa).toBeGreaterThan(2);
    expect(iinNoLoadMa).toBeLessThan(20);
    expect(Math.abs(Number(await client.query('MEAS:VOLT:OUT?')) / 3.3 - 1)).toBeLessThan(0.02);
    await client.write('LOAD:CURR 5');
    await client.write('LOAD ON');
    expect(await client.query('*OPC?')).toBe('1');
    const readings = [];
    for (const q of ['MEAS:VOLT:IN?', 'MEAS:CURR:IN?', 'MEAS:VOLT:OUT?', 'MEAS:CURR:OUT?']) readings.push(Number(await client.query(q)));
    const [vin, iin, vout, iout] = readings;
    // efficiency η = Pout/Pin from the terminal readings (textbook definition, docs/reference.md)
    const efficiencyPct = (100 * vout * iout) / (vin * iin);
    expect(efficiencyPct).toBeGreaterThan(88);
    expect(efficiencyPct).toBeLessThan(96);
    await client.write('CAPT:RATE 10 MHz');
    await client.write('CAPT:POIN 500');
    await client.write('CAPT:INIT');
    const record = (await client.query('CAPT:DATA?')).split(',');
    expect(record).toHaveLength(500);
    expect(record.every((v) => /^[+-]\d\.\d{5}E[+-]\d{2}$/.test(v))).toBe(true);
    expect(await client.query('PROT:TEST? 9')).toMatch(/^1,1,[+-]\d\.\d{5}E[+-]\d{2},[+-]\d\.\d{5}E[+-]\d{2}$/);
    expect(await client.query('SYST:ERR?')).toBe('0,"No error"');
    detachSimulator('mock:FX-102');
  });

  it('reports errors through the queue', async () => {
    attachSimulator('mock:FX-103', new FixtureSimulator({ fixtureId: 'FX-103', timing: 'instant' }));
    const { client } = await open('mock:FX-103');
    await client.write('SOUR:VOLT 75');
    await client.write('LOAD:CURR 12');
    expect(await client.query('NOPE?')).toBe('+9.91000E+37');
    expect(await client.query('SYST:ERR?')).toMatch(/^-222,"Data out of range; source voltage 75 V/);
    expect(await client.query('SYST:ERR?')).toMatch(/^-222,"Data out of range; load current 12 A/);
    expect(await client.query('SYST:ERR?')).toMatch(/^-113,/);
    expect(await client.query('SYST:ERR?')).toBe('0,"No error"');
    detachSimulator('mock:FX-103');
  });

  it('makes the fixture safe when the port closes, and answers again after reopening', async () => {
    const sim = new FixtureSimulator({ fixtureId: 'FX-104', timing: 'instant' });
    attachSimulator('mock:FX-104', sim);
    const first = await open('mock:FX-104');
    for (const line of ['SOUR:VOLT 12', 'OUTP ON', 'LOAD ON']) await first.client.write(line);
    expect(await first.client.query('OUTP?')).toBe('1');
    await close(first.port);
    expect(sim.state()).toMatchObject({ sourceOn: false, loadOn: false });
    expect(sim.safeStateReason).toMatch(/closed/);
    const second = await open('mock:FX-104');
    expect(await second.client.query('OUTP?')).toBe('0');
    expect(simulatorAt('mock:FX-104')).toBe(sim);
    expect(detachSimulator('mock:FX-104')).toBe(true);
    expect(sim.safeStateReason).toMatch(/detached/);
    await expect(second.client.query('*IDN?', 200)).rejects.toThrow(/no reply/);
    expect(detachSimulator('mock:FX-104')).toBe(false);
  });

  it('refuses to open a path nothing was attached to', async () => {
    await expect(open('mock:NOWHERE')).rejects.toThrow(/Port does not exist/);
  });
});
