import type { Sequelize } from "sequelize";
import { Organisation } from "./organisation";
import { User } from "./user";
import { Session } from "./session";
import { SignInAttempt } from "./sign-in-attempt";
import { AccountToken } from "./account-token";
import { AuditEntry } from "./audit-entry";
import { Circuit } from "./circuit";
import { Crossing } from "./crossing";
import { LoadProfile, LoadProfileSeries, LoadProfileVersion } from "./load-profile";
import { DeviceProfile } from "./device-profile";
import { OrganisationPolicy } from "./organisation-policy";
import { Study } from "./study";
import { LightingOption } from "./lighting-option";
import { ApiKey } from "./api-key";
import { IdempotencyKey } from "./idempotency-key";
import { RateLimitHit } from "./rate-limit-hit";
import { Job } from "./job";
import { CrossingReview } from "./crossing-review";
import { ReviewEvent } from "./review-event";
import { OutboxMessage } from "./outbox-message";
import { Webhook, WebhookDelivery } from "./webhook";
import { RuleBookChange, RuleBookRule } from "./rule-book";

export { Organisation, User, Session, SignInAttempt, AccountToken, AuditEntry, Circuit, Crossing, LoadProfile, LoadProfileSeries, LoadProfileVersion, DeviceProfile, OrganisationPolicy, Study, LightingOption, ApiKey, RateLimitHit, IdempotencyKey, Job, CrossingReview, ReviewEvent, OutboxMessage, Webhook, WebhookDelivery, RuleBookRule, RuleBookChange };
export type { AccountTokenKind } from "./account-token";
export type { JobState } from "./job";

export function initModels(sequelize: Sequelize): void {
  for (const model of [Organisation, User, Session, SignInAttempt, AccountToken, AuditEntry, Circuit, Crossing, LoadProfile, LoadProfileSeries, LoadProfileVersion, DeviceProfile, OrganisationPolicy, Study, LightingOption, ApiKey, RateLimitHit, IdempotencyKey, Job, CrossingReview, ReviewEvent, OutboxMessage, Webhook, WebhookDelivery, RuleBookRule, RuleBookChange]) {
    model.initModel(sequelize);
  }
  User.belongsTo(Organisation, { foreignKey: "organisationId" });
  ApiKey.belongsTo(Organisation, { foreignKey: "organisationId" });
  ApiKey.belongsTo(User, { foreignKey: "createdBy", as: "creator" });
  Session.belongsTo(User, { foreignKey: "userId" });
  AccountToken.belongsTo(User, { foreignKey: "userId" });
  AuditEntry.belongsTo(User, { foreignKey: "userId" });
  Circuit.hasMany(Crossing, { foreignKey: "circuitId" });
  Crossing.belongsTo(Circuit, { foreignKey: "circuitId" });
  Circuit.hasMany(LoadProfile, { foreignKey: "circuitId" });
  LoadProfile.belongsTo(Circuit, { foreignKey: "circuitId" });
  LoadProfile.hasOne(LoadProfileSeries, { foreignKey: "profileId" });
  Study.belongsTo(Crossing, { foreignKey: "crossingId" });
  Study.belongsTo(Circuit, { foreignKey: "circuitId" });
  Crossing.hasMany(Study, { foreignKey: "crossingId" });
  Crossing.hasMany(LightingOption, { foreignKey: "crossingId" });
  LightingOption.belongsTo(Crossing, { foreignKey: "crossingId" });
  Crossing.hasOne(CrossingReview, { foreignKey: "crossingId" });
  CrossingReview.belongsTo(Crossing, { foreignKey: "crossingId" });
  ReviewEvent.belongsTo(User, { foreignKey: "userId" });
  RuleBookChange.belongsTo(RuleBookRule, { foreignKey: "ruleId" });
}
