import { Umzug, SequelizeStorage } from "umzug";
import type { QueryInterface, Sequelize } from "sequelize";
import * as m001 from "./migrations/001-accounts";
import * as m002 from "./migrations/002-circuits-profiles";
import * as m003 from "./migrations/003-devices-studies";
import * as m005 from "./migrations/005-api-keys";
import * as m004 from "./migrations/004-crossing-details-options";
import * as m007 from "./migrations/007-security";
import * as m008 from "./migrations/008-jobs";
import * as m009 from "./migrations/009-idempotency";
import * as m010 from "./migrations/010-reviews";
import * as m011 from "./migrations/011-webhooks";
import * as m012 from "./migrations/012-profile-versions-timezone";
import * as m014 from "./migrations/014-rule-book";
import * as m015 from "./migrations/015-api-scopes";
import * as m020 from "./migrations/020-wires-at-top";
import * as m021 from "./migrations/021-crossing-temperatures";
import * as m022 from "./migrations/022-organisation-revision";

export type MigrationContext = QueryInterface;
export interface Migration {
  up(args: { context: QueryInterface }): Promise<void>;
  down(args: { context: QueryInterface }): Promise<void>;
}

// Listed explicitly (not globbed) so the migrations are bundled with the server build too.
const MIGRATIONS: [string, Migration][] = [
  ["001-accounts", m001],
  ["002-circuits-profiles", m002],
  ["003-devices-studies", m003],
  ["004-crossing-details-options", m004],
  ["005-api-keys", m005],
  ["007-security", m007],
  ["008-jobs", m008],
  ["009-idempotency", m009],
  ["010-reviews", m010],
  ["011-webhooks", m011],
  ["012-profile-versions-timezone", m012],
  ["014-rule-book", m014],
  ["015-api-scopes", m015],
  ["020-wires-at-top", m020],
  ["021-crossing-temperatures", m021],
  ["022-organisation-revision", m022],
];

export function createMigrator(sequelize: Sequelize) {
  return new Umzug({
    migrations: MIGRATIONS.map(([name, m]) => ({ name, up: m.up, down: m.down })),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: "schema_migrations" }),
    logger: undefined,
  });
}

export async function migrateUp(sequelize: Sequelize): Promise<string[]> {
  const done = await createMigrator(sequelize).up();
  return done.map((m) => m.name);
}
