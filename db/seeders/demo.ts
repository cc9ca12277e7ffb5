import type { Sequelize } from "sequelize";
import { Organisation, User } from "../models";
import { hashPassword } from "../../lib/passwords";
import type { Role } from "../../shared/roles";

export const DEMO_PASSWORD = "duskline-demo";
export const DEMO_ORGANISATION = "Lanterncrest Power Cooperative (demo)";
export const DEMO_ACCOUNTS: { email: string; name: string; role: Role }[] = [
  { email: "admin@example.com", name: "Avery Admin", role: "admin" },
  { email: "engineer@example.com", name: "Ellis Engineer", role: "engineer" },
  { email: "consultant@example.com", name: "Casey Consultant", role: "consultant" },
  { email: "manager@example.com", name: "Morgan Manager", role: "manager" },
];

/** Seeds the invented demo organisation and its four accounts when the database is empty. */
export async function seedDemoAccounts(sequelize: Sequelize): Promise<Organisation | null> {
  if ((await Organisation.count()) > 0) return null;
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  return sequelize.transaction(async (transaction) => {
    const org = await Organisation.create({ name: DEMO_ORGANISATION }, { transaction });
    for (const a of DEMO_ACCOUNTS) {
      await User.create({ ...a, organisationId: org.id, passwordHash }, { transaction });
    }
    return org;
  });
}
