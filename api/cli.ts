import './db/pg-types';
import { createKnex, migrateLatest, rollbackAll } from './db/knex';
import { seedDemo } from './db/seed';

/** Database chores used by scripts/start.mjs and the db:* npm scripts. */
async function main(command: string | undefined) {
  const url = process.env.DATABASE_URL;
  if (!url) {
    console.error('DATABASE_URL is not set. Run this through `npm start` / `npm run db:migrate`, which start the local cluster.');
    process.exit(2);
  }
  // Migrations and the seed may run long: no statement limit here.
  const knex = createKnex(url, { min: 0, max: 2 }, { statementMs: 0, idleInTransactionMs: 0 });
  try {
    if (command === 'migrate' || command === 'prepare') {
      const applied = await migrateLatest(knex);
      console.log(applied.length ? `migrations applied: ${applied.join(', ')}` : 'migrations: already up to date');
    }
    if (command === 'seed' || command === 'prepare') {
      const counts = await seedDemo(knex);
      console.log(
        `demo scenario seeded (${Object.entries(counts)
          .map(([k, v]) => `${v} ${k}`)
          .join(', ')})`,
      );
    }
    if (command === 'rollback') {
      await knex.migrate.rollback();
      console.log('rolled back the last batch of migrations');
    }
    if (command === 'reset') {
      await rollbackAll(knex);
      console.log('rolled back every migration');
    }
    if (!['migrate', 'prepare', 'seed', 'rollback', 'reset'].includes(command ?? '')) {
      console.error('usage: cli.ts migrate|seed|prepare|rollback|reset');
      process.exitCode = 2;
    }
  } finally {
    await knex.destroy();
  }
}

main(process.argv[2]).catch((err: Error) => {
  console.error(`database command failed: ${err.message}`);
  process.exit(1);
});
