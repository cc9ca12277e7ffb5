// Direct database access for integration tests (the same models the app uses).
import { connectDb } from "../../db/index";
import { parseEnv } from "../../app/utils/env.server";

export function testDb() {
  return connectDb(parseEnv(process.env));
}
