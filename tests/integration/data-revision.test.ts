// The organisation's data revision (organisationRevision in app/services/audit.server.ts): the
// version under which portfolio rows and study pages are kept. It must move on after an audited
// change commits, not before and not for a rolled-back one, and two writers committing out of
// order must each move it (the latest audit entry's id, the version before, did not).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import type { Sequelize } from "sequelize";
import { closeDb } from "../../db/index";
import { Circuit, Crossing, Organisation } from "../../db/models";
import { audit, organisationRevision } from "../../app/services/audit.server";
import { portfolioRows } from "../../app/services/portfolio.server";
import { testDb } from "../support/db";

let sequelize: Sequelize;
let organisationId: number;
let circuitId: number;
let crossingId: number;
const actor = () => ({ id: null, organisationId });

beforeAll(async () => {
  sequelize = testDb();
  // An organisation of its own, so that no other test's change moves its revision.
  const tag = randomUUID().slice(0, 8);
  organisationId = (await Organisation.create({ name: `Revision check ${tag}` })).id;
  circuitId = (await Circuit.create({ organisationId, name: "Revision line", voltageKv: 115, phases: 3, normalRatingA: null, notes: null })).id;
  crossingId = (await Crossing.create({ organisationId, circuitId, name: "Before", lat: 45.1, lon: -100.2, spanLengthValue: 300, spanLengthUnit: "m", kind: "river" })).id;
});
afterAll(async () => {
  await Crossing.destroy({ where: { organisationId } });
  await Circuit.destroy({ where: { organisationId } });
  await closeDb();
});

describe("organisation data revision", () => {
  it("moves on once an audited change commits, and not for one rolled back", async () => {
    const start = Number(await organisationRevision(organisationId));
    const t = await sequelize.transaction();
    await audit(actor(), "update", "crossing", crossingId, null, t);
    expect(Number(await organisationRevision(organisationId))).toBe(start);
    await t.commit();
    expect(Number(await organisationRevision(organisationId))).toBe(start + 1);

    const rolledBack = await sequelize.transaction();
    await audit(actor(), "update", "crossing", crossingId, null, rolledBack);
    await rolledBack.rollback();
    expect(Number(await organisationRevision(organisationId))).toBe(start + 1);

    // An audit outside a transaction moves it at once.
    await audit(actor(), "update", "circuit", circuitId);
    expect(Number(await organisationRevision(organisationId))).toBe(start + 2);
  });

  it("two writers committing out of order: rows read between the commits are not kept after the second", async () => {
    // The first writer renames the crossing and writes its audit row first (the lower id) ...
    const first = await sequelize.transaction();
    await Crossing.update({ name: "After" }, { where: { id: crossingId }, transaction: first });
    await audit(actor(), "update", "crossing", crossingId, { name: "After" }, first);
    // ... the second writes and commits before it.
    const second = await sequelize.transaction();
    await audit(actor(), "update", "circuit", circuitId, null, second);
    await second.commit();
    // A read between the two commits sees the old name, and is kept under the revision it read.
    const between = await portfolioRows(organisationId);
    expect(between.find((r) => r.crossingId === crossingId)?.crossing).toBe("Before");
    await first.commit();
    // The first commit moved the revision again, so the next read is fresh.
    const after = await portfolioRows(organisationId);
    expect(after.find((r) => r.crossingId === crossingId)?.crossing).toBe("After");
  });
});
