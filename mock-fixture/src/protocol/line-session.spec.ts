import { describe, expect, it } from 'vitest';
import { FixtureSimulator } from './fixture-simulator';
import { LineSession, MAX_PENDING_CHARS } from './line-session';

function session() {
  const sim = new FixtureSimulator({ fixtureId: 'FX-102', timing: 'instant', config: { defectRates: {} } });
  const sent: string[] = [];
  const s = new LineSession(sim, (text) => {
    sent.push(text);
  });
  return { sim, sent, s };
}

describe('LineSession', () => {
  it('reassembles lines split across chunks and answers in order', async () => {
    const { sent, s } = session();
    s.feed('*ID');
    s.feed(Buffer.from('N?\r\nSOUR:VOLT 12\nSOUR:VO'));
    s.feed('LT?\n*OPC?\n');
    await s.idle();
    expect(sent).toEqual(['RAILWRIGHT,SIM-FIXTURE,FX-102,0.1.0\n', '+1.20000E+01\n', '1\n']);
  });

  it('reports an over-long line instead of dropping it silently', async () => {
    const { sent, s } = session();
    s.feed('x'.repeat(MAX_PENDING_CHARS + 1));
    s.feed('\nSYST:ERR?\n');
    await s.idle();
    // the discarded run is reported; what followed it up to the newline is one (refused) line
    expect(sent[0]).toMatch(/^-223,"Too much data; 65537 characters arrived without a newline; they were discarded"\n$/);
  });

  it('makes the fixture safe and goes quiet when the link closes', async () => {
    const { sim, sent, s } = session();
    s.feed('SOUR:VOLT 12\nOUTP ON\nLOAD ON\n');
    await s.idle();
    expect(sim.state()).toMatchObject({ sourceOn: true, loadOn: true });
    s.close('link lost');
    expect(sim.state()).toMatchObject({ sourceOn: false, loadOn: false });
    expect(sim.safeStateReason).toBe('link lost');
    s.feed('*IDN?\n');
    await s.idle();
    expect(sent).toEqual([]);
  });
});
