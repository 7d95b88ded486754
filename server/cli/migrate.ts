import { readEnv } from '../env';
import { openDatabase } from '../db/client';

const env = readEnv();
const db = openDatabase(env.DATABASE_PATH);
console.log(`Migrations applied to ${env.DATABASE_PATH}.`);
db.$client.close();
