/**
 * `node --import tsx src/demo-releases.ts BASE_URL`: play the demo releases (src/demo) through the
 * server running at BASE_URL, if its demo designs have no release yet. Used by `npm start` once the
 * server answers; takes a minute or two, most of it the server verifying the approved releases' RTL.
 */
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from './seed.ts';
import { seedDemoReleases } from './demo/demoReleases.ts';

const baseUrl = process.argv[2];
if (!baseUrl) {
  process.stderr.write('usage: demo-releases.ts BASE_URL\n');
  process.exit(2);
}
const email = (role: string) => DEMO_ACCOUNTS.find((a) => a.roles.includes(role as never))!.email;
const say = (line: string) => process.stdout.write(`loopwright-demo: ${line}\n`);
const result = await seedDemoReleases(baseUrl, { designer: email('designer'), reviewer: email('reviewer'), firmware: email('firmware'), password: DEMO_PASSWORD }, say);
say(result.seeded ? `${result.releases} demo releases in every state seeded in ${result.seconds} s` : `demo releases skipped (${result.reason})`);
