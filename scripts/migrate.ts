// `npm run migrate`: applies pending migrations as MIGRATION_DATABASE_URL's role and grants
// DATABASE_URL's role the rows (for a database outside the project's own cluster; `npm start`
// migrates its own by itself).
import { migrate } from '../db/migrator';

const applied = await migrate();
console.log(applied.length ? `applied: ${applied.join(', ')}` : 'schema up to date');
