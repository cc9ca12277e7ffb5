import { Sequelize } from "sequelize";
import * as mariadb from "mariadb";
import { initModels } from "./models/index";

export interface DbConfig {
  DB_HOST: string;
  DB_PORT: number;
  DB_NAME: string;
  DB_USER: string;
  DB_PASSWORD: string;
}

let instance: Sequelize | undefined;

/** The one Sequelize instance of the process; created on first call. */
export function connectDb(config: DbConfig): Sequelize {
  if (instance) return instance;
  instance = new Sequelize(config.DB_NAME, config.DB_USER, config.DB_PASSWORD, {
    host: config.DB_HOST,
    port: config.DB_PORT,
    dialect: "mariadb",
    // The bundler can hide the driver from Sequelize's dynamic require.
    dialectModule: mariadb,
    logging: false,
    timezone: "+00:00",
    dialectOptions: { connectTimeout: 10_000 },
    pool: { max: 10, min: 0, idle: 10_000 },
    define: { underscored: true },
  });
  initModels(instance);
  return instance;
}

export async function closeDb(): Promise<void> {
  if (instance) {
    await instance.close();
    instance = undefined;
  }
}
