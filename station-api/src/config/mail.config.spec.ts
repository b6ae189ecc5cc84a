import 'reflect-metadata';
import { describe, expect, it } from 'vitest';
import { mailSettingsFrom } from './mail.config';

describe('mail settings', () => {
  it('captures locally in the demo unless told otherwise', () => {
    expect(mailSettingsFrom({ RAILWRIGHT_DEMO: '1' }).capture).toBe(true);
    expect(mailSettingsFrom({ RAILWRIGHT_DEMO: '1', MAIL_CAPTURE: '0' }).capture).toBe(false);
    expect(mailSettingsFrom({}).capture).toBe(false);
    expect(mailSettingsFrom({ MAIL_CAPTURE: '1', MAIL_CAPTURE_PORT: '0' })).toMatchObject({ capture: true, capturePort: 0 });
  });

  it('reads the SMTP server and sender', () => {
    expect(mailSettingsFrom({ SMTP_HOST: 'mail.orrinbay.example', SMTP_PORT: '587', SMTP_FROM: 'eol@orrinbay.example' })).toMatchObject({
      smtpHost: 'mail.orrinbay.example',
      smtpPort: 587,
      from: 'eol@orrinbay.example',
    });
  });

  it('refuses bad values, naming the setting', () => {
    expect(() => mailSettingsFrom({ SMTP_PORT: '70000' })).toThrow(/SMTP_PORT/);
    expect(() => mailSettingsFrom({ SMTP_FROM: 'not an address' })).toThrow(/SMTP_FROM must be one e-mail address/);
    expect(() => mailSettingsFrom({ MAIL_CAPTURE: 'yes' })).toThrow(/MAIL_CAPTURE/);
  });
});
