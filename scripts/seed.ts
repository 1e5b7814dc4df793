// npm run seed — put the demo project into the database (idempotent).
import { databasePath, openDatabase } from '../src/lib/server/db/index';
import { DEMO_PASSWORD, DEMO_USERS, seedDemo } from '../src/lib/server/demo';

const database = openDatabase();
const { projectId, created } = await seedDemo(database);
console.log(
	created
		? `Seeded the demo project (id ${projectId}) into ${databasePath()}.`
		: `The demo project is already in ${databasePath()} (id ${projectId}); nothing changed.`
);
console.log(`Demo sign-ins (password ${DEMO_PASSWORD}): ${DEMO_USERS.map((u) => u.email).join(', ')}`);
database.$client.close();
