// `npm run migrate`: applies pending migrations to DATABASE_URL (for a database outside the
// project's own cluster; `npm start` migrates its own by itself).
import { sequelize } from '../db';
import { migrate } from '../db/migrator';

const applied = await migrate(sequelize);
console.log(applied.length ? `applied: ${applied.join(', ')}` : 'schema up to date');
await sequelize.close();
