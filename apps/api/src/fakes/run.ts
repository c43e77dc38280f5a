// Starts every local fake for `npm start` and `npm test`. This is a dev tool beside the app,
// so it reads its own ports from the environment instead of going through config.ts.
import type { Fake } from './fake.js';
import { createMailCatcher } from './mail-catcher.js';
import { createPushFake } from './push-fake.js';
import { createS3Fake } from './s3-fake.js';
import { createStripeFake } from './stripe-fake.js';
import { createWeatherFake } from './weather-fake.js';

function port(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const value = Number(raw);
  if (!Number.isInteger(value) || value < 0 || value > 65535) {
    throw new Error(`${name} must be a port number, got "${raw}"`);
  }
  return value;
}

// Add a fake here: one entry, built from its own env ports.
const fakes: Fake[] = [
  createMailCatcher({ smtpPort: port('MAIL_SMTP_PORT', 1025), httpPort: port('MAIL_HTTP_PORT', 1080) }),
  createS3Fake({ port: port('S3_FAKE_PORT', 4569), directory: process.env.S3_FAKE_DIR || '.data/s3', bucket: process.env.S3_BUCKET || 'hodboard-photos' }),
  createPushFake({ port: port('PUSH_FAKE_PORT', 4570) }),
  createStripeFake({
    port: port('STRIPE_API_PORT', 12111),
    // Test-mode placeholders only: the fake never talks to the real service.
    secretKey: process.env.STRIPE_SECRET_KEY || 'sk_test_local_fake',
    webhookSecret: process.env.STRIPE_WEBHOOK_SECRET || 'whsec_local_fake',
    webhookUrl: process.env.STRIPE_WEBHOOK_URL || `${process.env.APP_URL || 'http://localhost:3000'}/api/payments/stripe-webhook`,
  }),
  createWeatherFake({ port: port('WEATHER_FAKE_PORT', 1090) }),
];

const started: Fake[] = [];

async function stopAll(): Promise<void> {
  for (const fake of started.reverse()) {
    await fake.stop().catch((err: unknown) => console.error(`fake ${fake.name}: stop failed`, err));
  }
}

async function main(): Promise<void> {
  for (const fake of fakes) {
    const lines = await fake.start();
    started.push(fake);
    for (const line of lines) console.log(`fake ${fake.name}: ${line}`);
  }
  // scripts/lib wait for this exact line before going on.
  console.log('fakes ready');
}

let stopping = false;
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.on(signal, () => {
    if (stopping) return;
    stopping = true;
    void stopAll().then(() => process.exit(0));
  });
}

main().catch(async (err: unknown) => {
  console.error('fakes failed to start:', err instanceof Error ? err.message : err);
  await stopAll();
  process.exit(1);
});
