import { plainToInstance, Type } from 'class-transformer';
import { IsIn, IsInt, IsOptional, IsString, Matches, Max, Min, validateSync } from 'class-validator';

/**
 * E-mail settings (hold alerts). Read here, like every other setting, and checked when the mail module starts,
 * so a bad value stops the server with a line naming it. Documented in docs/holds-and-alerts.md and .env.example.
 */
export class MailEnvironment {
  /** SMTP server that delivers the alerts; empty: no outside server (see MAIL_CAPTURE) */
  @IsOptional() @IsString() @Matches(/^$|^[0-9A-Za-z.:_-]{1,253}$/, { message: 'SMTP_HOST must be a host name or IP address, e.g. mail.orrinbay.example' })
  SMTP_HOST: string = '';

  @IsOptional() @Type(() => Number) @IsInt() @Min(1) @Max(65535)
  SMTP_PORT: number = 25;

  /** Sender address of every alert */
  @IsOptional() @IsString() @Matches(/^[^\s@<>]+@[^\s@<>]+$/, { message: 'SMTP_FROM must be one e-mail address, e.g. railwright@orrinbay.example' })
  SMTP_FROM: string = 'railwright@orrinbay.example';

  /**
   * Users have no e-mail field: a person's address is `<username>@MAIL_DOMAIN`.
   */
  @IsOptional() @IsString() @Matches(/^[0-9A-Za-z.-]{1,253}$/, { message: 'MAIL_DOMAIN must be a domain name, e.g. orrinbay.example' })
  MAIL_DOMAIN: string = 'orrinbay.example';

  /**
   * '1': the server starts its own small SMTP server on 127.0.0.1 and sends every alert there, keeping what
   * it receives (demo and tests: no mail leaves the computer). Empty: on in the demo (RAILWRIGHT_DEMO=1), off
   * otherwise. When on, SMTP_HOST and SMTP_PORT are not used.
   */
  @IsOptional() @IsIn(['0', '1', ''], { message: "MAIL_CAPTURE must be '1' (local capture server), '0' or empty" })
  MAIL_CAPTURE: '0' | '1' | '' = '';

  /** Port of the local capture server; 0 takes any free port (tests) */
  @IsOptional() @Type(() => Number) @IsInt() @Min(0) @Max(65535)
  MAIL_CAPTURE_PORT: number = 2525;

  /** Delivery attempts per message before it is marked failed */
  @IsOptional() @Type(() => Number) @IsInt() @Min(1) @Max(10)
  MAIL_ATTEMPTS: number = 3;

  /** Wait before the first retry, ms; doubled before each next one */
  @IsOptional() @Type(() => Number) @IsInt() @Min(0) @Max(600_000)
  MAIL_RETRY_DELAY_MS: number = 2_000;

  @IsOptional() @IsIn(['0', '1', ''])
  RAILWRIGHT_DEMO: '0' | '1' | '' = '';
}

export interface MailSettings {
  smtpHost: string;
  smtpPort: number;
  from: string;
  domain: string;
  /** Start the local capture server and send there */
  capture: boolean;
  capturePort: number;
  attempts: number;
  retryDelayMs: number;
}

export function mailSettingsFrom(raw: Record<string, unknown>): MailSettings {
  const env = plainToInstance(MailEnvironment, raw, { enableImplicitConversion: false, exposeDefaultValues: true });
  const errors = validateSync(env, { skipMissingProperties: false, whitelist: false });
  if (errors.length > 0) {
    const lines = errors.map((e) => `  ${e.property}: ${Object.values(e.constraints ?? {}).join('; ')}`);
    throw new Error(`Mail configuration is not valid:\n${lines.join('\n')}`);
  }
  const capture = env.MAIL_CAPTURE === '1' || (env.MAIL_CAPTURE === '' && env.RAILWRIGHT_DEMO === '1');
  return {
    smtpHost: env.SMTP_HOST,
    smtpPort: env.SMTP_PORT,
    from: env.SMTP_FROM,
    domain: env.MAIL_DOMAIN,
    capture,
    capturePort: env.MAIL_CAPTURE_PORT,
    attempts: env.MAIL_ATTEMPTS,
    retryDelayMs: env.MAIL_RETRY_DELAY_MS,
  };
}

/** Reads and checks the mail settings from the environment (the only place they are read). */
export function loadMailSettings(): MailSettings {
  return mailSettingsFrom(process.env as Record<string, unknown>);
}
