import type { Sequelize } from "sequelize";
import { Organisation } from "./organisation";
import { User } from "./user";
import { Session } from "./session";
import { SignInAttempt } from "./sign-in-attempt";
import { AccountToken } from "./account-token";
import { AuditEntry } from "./audit-entry";

export { Organisation, User, Session, SignInAttempt, AccountToken, AuditEntry };
export type { AccountTokenKind } from "./account-token";

export function initModels(sequelize: Sequelize): void {
  for (const model of [Organisation, User, Session, SignInAttempt, AccountToken, AuditEntry]) {
    model.initModel(sequelize);
  }
  User.belongsTo(Organisation, { foreignKey: "organisationId" });
  Session.belongsTo(User, { foreignKey: "userId" });
  AccountToken.belongsTo(User, { foreignKey: "userId" });
  AuditEntry.belongsTo(User, { foreignKey: "userId" });
}
