/**
 * `npm run db:seed`: seeds the demo scenario into an empty database.
 * `npm run db:seed -- --reset`: deletes the database and stored files first, then seeds.
 */
import { readEnv } from '../env';
import { openDatabase } from '../db/client';
import { isEmpty, printDemoSignIns, seedDemo } from '../db/seed/demo';
import { removeDatabaseFiles } from '../db/seed/reset';
import { systemClock, today } from '../lib/clock';

function main(argv: string[]): number {
  const unknown = argv.filter((a) => a !== '--reset');
  if (unknown.length > 0) {
    console.error(`Unknown argument(s): ${unknown.join(' ')}\nUsage: npm run db:seed [-- --reset]`);
    return 2;
  }
  let env;
  try {
    env = readEnv();
  } catch (e) {
    console.error((e as Error).message);
    return 1;
  }
  if (argv.includes('--reset')) {
    // Files in a remote bucket are left alone: only a local file store is emptied.
    const localStore = env.STORAGE_DRIVER === 'local' ? env.STORAGE_DIR : null;
    removeDatabaseFiles(env.DATABASE_PATH, localStore);
    console.log(localStore ? `Removed ${env.DATABASE_PATH} and the files under ${localStore}.` : `Removed ${env.DATABASE_PATH} (the remote file store is left as it is).`);
  }
  const db = openDatabase(env.DATABASE_PATH);
  try {
    if (!isEmpty(db)) {
      console.log(`Database ${env.DATABASE_PATH} already seeded; run \`npm run db:seed -- --reset\` to start over.`);
    } else {
      const s = seedDemo(db, { pepper: env.PASSWORD_PEPPER, bcryptCost: env.BCRYPT_COST, today: today(systemClock) });
      const states = Object.entries(s.claimsByState)
        .map(([k, v]) => `${k} ${v}`)
        .join(', ');
      console.log(`Seeded the demo scenario into ${env.DATABASE_PATH}:`);
      console.log(`  ${s.organisations} organisations, ${s.users} users, ${s.certifications} certifications`);
      console.log(`  ${s.productFamilies} product families, ${s.models} models, ${s.parts} parts, ${s.repairCodes} repair codes, ${s.readingSpecs} reading specs`);
      console.log(`  ${s.sites} restaurants, ${s.units} units, ${s.paymentRuns} payment runs`);
      console.log(`  ${s.claims} claims (${states}), ${s.claimEvents} claim events, ${s.comments} comments`);
    }
    printDemoSignIns();
  } finally {
    db.$client.close();
  }
  return 0;
}

process.exitCode = main(process.argv.slice(2));
