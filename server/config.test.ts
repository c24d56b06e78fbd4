import { describe, expect, it } from 'vitest';
import { ConfigError, loadConfig } from './config';

// A production environment with every secret and service set to something of its own.
const production = {
  NODE_ENV: 'production',
  PUBLIC_URL: 'https://mission.saltmarsh.example',
  DATABASE_URL: 'postgres://lightkeel@127.0.0.1:5432/lightkeel',
  SESSION_SECRET: 'a-long-random-production-session-secret',
  STRIPE_SECRET_KEY: 'sk_live_fictional_0123456789',
  STRIPE_WEBHOOK_SECRET: 'whsec_fictional_0123456789',
  STRIPE_API_BASE_URL: '',
  RESEND_API_KEY: 're_fictional_0123456789',
  RESEND_BASE_URL: 'https://mail-api.saltmarsh.example',
  GOOGLE_CLIENT_ID: 'fictional-client.apps.example',
  GOOGLE_CLIENT_SECRET: 'fictional-client-secret',
  GOOGLE_OAUTH_BASE_URL: '',
};

function configErrorOf(env: Record<string, string | undefined>): string {
  try {
    loadConfig(env);
  } catch (err) {
    expect(err).toBeInstanceOf(ConfigError);
    return (err as Error).message;
  }
  throw new Error('loadConfig accepted the environment');
}

describe('loadConfig in production', () => {
  it('starts with secrets and services of its own', () => {
    const config = loadConfig(production);
    expect(config.NODE_ENV).toBe('production');
    expect(config.SESSION_SECRET).toBe(production.SESSION_SECRET);
    expect(config.STRIPE_API_BASE_URL).toBe('');
  });

  it.each([
    ['SESSION_SECRET', 'lightkeel-local-session-secret-change-me'],
    ['STRIPE_SECRET_KEY', 'sk_test_lightkeel_local'],
    ['STRIPE_WEBHOOK_SECRET', 'whsec_lightkeel_local'],
    ['RESEND_API_KEY', 're_lightkeel_local'],
    ['GOOGLE_CLIENT_ID', 'lightkeel-local-client'],
    ['GOOGLE_CLIENT_SECRET', 'lightkeel-local-secret'],
  ])('refuses to start while %s is the local default, given or left out', (name, localDefault) => {
    expect(configErrorOf({ ...production, [name]: localDefault })).toMatch(new RegExp(`${name}: .*local default`));
    expect(configErrorOf({ ...production, [name]: undefined })).toMatch(new RegExp(`${name}: .*local default`));
  });

  it.each([
    ['RESEND_BASE_URL', 'http://127.0.0.1:4020'],
    ['STRIPE_API_BASE_URL', 'http://localhost:4030'],
    ['GOOGLE_OAUTH_BASE_URL', 'http://[::1]:4010'],
    ['STRIPE_API_BASE_URL', 'http://127.8.0.1:4030'],
  ])('refuses to start while %s points at a loopback fake (%s)', (name, url) => {
    expect(configErrorOf({ ...production, [name]: url })).toMatch(new RegExp(`${name}: .*loopback`));
  });

  it.each(['RESEND_BASE_URL', 'STRIPE_API_BASE_URL', 'GOOGLE_OAUTH_BASE_URL'])('refuses the default %s (a local fake)', (name) => {
    expect(configErrorOf({ ...production, [name]: undefined })).toMatch(new RegExp(`${name}: `));
  });

  it('names every offending variable at once', () => {
    const message = configErrorOf({ NODE_ENV: 'production' });
    for (const name of [
      'SESSION_SECRET',
      'STRIPE_SECRET_KEY',
      'STRIPE_WEBHOOK_SECRET',
      'RESEND_API_KEY',
      'GOOGLE_CLIENT_ID',
      'GOOGLE_CLIENT_SECRET',
      'RESEND_BASE_URL',
      'STRIPE_API_BASE_URL',
      'GOOGLE_OAUTH_BASE_URL',
    ]) {
      expect(message).toContain(`${name}: `);
    }
  });

  it('keeps the local defaults outside production (npm start, tests)', () => {
    for (const NODE_ENV of ['development', 'test']) {
      const config = loadConfig({ NODE_ENV });
      expect(config.SESSION_SECRET).toBe('lightkeel-local-session-secret-change-me');
      expect(config.RESEND_BASE_URL).toBe('http://127.0.0.1:4020');
    }
  });
});
