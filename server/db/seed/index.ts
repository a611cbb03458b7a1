import type { Sequelize } from 'sequelize';
import { User } from '../../modules/users/user.model';
import { seedUsers } from './users';
import { seedFacility } from './facility';
import { seedTickets } from './tickets';
import { seedAlarms } from './alarms';
import { seedMaintenance } from './maintenance';
import { seedSettings } from './settings';

/**
 * The demo facility: invented people, tools and a year of history, generated from a fixed
 * seed so every machine gets the same demo. Runs only on an empty database.
 */
export async function seedDemo(sequelize: Sequelize, now = new Date()): Promise<{ seeded: boolean }> {
  if ((await User.count()) > 0) return { seeded: false };
  await sequelize.transaction(async (transaction) => {
    const people = await seedUsers(transaction);
    const facility = await seedFacility(transaction, people, now);
    // Tickets last: they follow the state history the facility step wrote.
    await seedTickets(transaction, people, now);
    await seedAlarms(transaction, facility, now);
    await seedMaintenance(sequelize, transaction, now);
    await seedSettings(transaction);
  });
  return { seeded: true };
}
