import { connectDb } from "../../db/index";
import { getEnv } from "./env.server";

/** The process-wide Sequelize instance, connected with the validated environment. */
export function db() {
  return connectDb(getEnv());
}
